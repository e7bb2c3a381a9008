/**
 * Building blocks shared by the configuration schemas (JSON Schema draft-07 fragments).
 *
 * @module
 */

/** A JSON Schema (draft-07) as a plain object. */
export type JsonSchema = { readonly [key: string]: unknown };

/** @internal A finite number > 0 with a description. */
export function positive(description: string): JsonSchema {
  return { type: 'number', exclusiveMinimum: 0, description };
}

/** @internal A finite number ≥ 0 with a description. */
export function nonNegative(description: string): JsonSchema {
  return { type: 'number', minimum: 0, description };
}

/** @internal Any finite number with a description. */
export function finite(description: string): JsonSchema {
  return { type: 'number', description };
}

/** @internal An integer in [min, max]. */
export function integer(description: string, min: number, max: number): JsonSchema {
  return { type: 'integer', minimum: min, maximum: max, description };
}

/** @internal A fixed-length array of numbers. */
export function numbers(description: string, length: number, item: JsonSchema = { type: 'number' }): JsonSchema {
  return { type: 'array', items: item, minItems: length, maxItems: length, description };
}

/** @internal A 3 × 3 rotation, row-major, nine numbers. */
export const ROTATION_SCHEMA: JsonSchema = numbers('A 3 × 3 rotation matrix, row-major, nine numbers.', 9);

/** @internal A point or vector in the world frame, metres. */
export function vec3(description: string): JsonSchema {
  return numbers(description, 3);
}

/** @internal A closed object: only the listed properties are allowed. */
export function object(
  description: string,
  properties: Record<string, JsonSchema>,
  required: readonly string[] = [],
): JsonSchema {
  return { type: 'object', description, properties, required: [...required], additionalProperties: false };
}
