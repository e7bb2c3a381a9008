/**
 * Status codes shared by every batch function. A batch function fills a `Uint8Array`
 * of these beside its output; a single-value function returns `null` or a result
 * object whose `status` is one of the {@link StatusName} strings.
 *
 * @module
 */

/** Numeric status codes, stable across versions (new codes are only ever appended). */
export const Status = {
  /** A result was computed. */
  ok: 0,
  /** Total internal reflection: no refracted ray exists. */
  tir: 1,
  /** A ray did not meet the surface (or left its domain first). */
  miss: 2,
  /** The inputs cannot come from the physics assumed (e.g. a ray pair no interface could produce). */
  inconsistent: 3,
  /** An iteration did not reach its tolerance within its cap. */
  notConverged: 4,
  /** A point lies outside a model's valid field or a grid's domain. */
  outside: 5,
  /** Light was blocked or lost on its way (off the plane, behind the mask). */
  blocked: 6,
  /** No partner was found (a spot without aperture, an aperture without spot). */
  unmatched: 7,
  /** More than one partner fits: refused rather than guessed. */
  ambiguous: 8,
  /** The guide light is below the horizon. */
  belowHorizon: 9,
  /** A measurement was clipped by the detector's full scale. */
  saturated: 10,
  /** Excluded by a mask. */
  masked: 11,
} as const;

/** The name of a status. */
export type StatusName = keyof typeof Status;

/** A numeric status code. */
export type StatusCode = (typeof Status)[StatusName];

const NAMES: readonly StatusName[] = (Object.keys(Status) as StatusName[]).sort((a, b) => Status[a] - Status[b]);

/**
 * The name of a numeric status code.
 *
 * @param code - A code from a status array.
 * @returns Its name, or `undefined` for an unknown code.
 * @example
 * ```ts
 * statusName(Status.tir); // "tir"
 * ```
 */
export function statusName(code: number): StatusName | undefined {
  return NAMES.find((n) => Status[n] === code);
}
