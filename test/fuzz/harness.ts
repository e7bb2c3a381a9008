/**
 * The fuzz harness: call a public function with given arguments and classify what
 * happened. A call passes when it returns (with no silent non-finite number in a
 * numeric output, unless the function documents NaN) or throws the library's own error
 * whose message names a parameter. It fails on any other exception, on a call slower
 * than its time bound, and on any change to its inputs.
 */
import { appendFileSync } from 'node:fs';
import { isMeniscusError } from '../../src/core/index.js';

/** Set `FUZZ_TRACE=/path/file` to log every call before it is made (to find a hang). */
const TRACE = process.env.FUZZ_TRACE;

/** What one call did. */
export interface Outcome {
  readonly kind: 'ok' | 'library-error' | 'defect';
  /** For defects: why. */
  readonly why?: string;
  /** For library errors: the parameter named. */
  readonly parameter?: string;
  readonly ms: number;
}

/** How to judge one callable. */
export interface CallPolicy {
  /** Argument positions that are outputs (`out` first in small-vector kernels). */
  readonly outArgs?: readonly number[];
  /** Non-finite numbers in the result are documented (NaN for masked samples …). */
  readonly nonFiniteOk?: boolean;
  /** Wall-clock bound per call, ms. */
  readonly timeLimitMs?: number;
  /** Skip the "error names a declared parameter" check (argument-check helpers name whatever they are told). */
  readonly freeNaming?: boolean;
  /** File-system errors (`ENOENT`, `EISDIR` …) are the environment's answer, not a defect (node area). */
  readonly systemErrorsOk?: boolean;
}

const MAX_DEPTH = 6;

/** Option fields that are output buffers, written by design (`options.out`, `options.status` …). */
export const OUTPUT_KEYS = new Set(['out', 'status', 'origins', 'directions']);

/** A deep copy of what matters for mutation checks: typed-array bytes, array items, own fields. */
export function snapshot(v: unknown, depth = 0, seen = new Map<object, unknown>()): unknown {
  if (v === null || typeof v !== 'object') return v;
  if (seen.has(v)) return seen.get(v);
  if (depth > MAX_DEPTH) return v;
  if (ArrayBuffer.isView(v)) {
    const bytes = new Uint8Array(v.buffer, v.byteOffset, v.byteLength).slice();
    seen.set(v, bytes);
    return bytes;
  }
  if (v instanceof ArrayBuffer) return new Uint8Array(v.slice(0));
  if (v instanceof Date) return { date: v.getTime() };
  if (Array.isArray(v)) {
    const a: unknown[] = [];
    seen.set(v, a);
    for (const x of v) a.push(snapshot(x, depth + 1, seen));
    return a;
  }
  const o: Record<string, unknown> = {};
  seen.set(v, o);
  for (const k of Object.keys(v)) {
    let x: unknown;
    try {
      x = (v as Record<string, unknown>)[k];
    } catch {
      x = '<getter threw>';
    }
    o[k] = snapshot(x, depth + 1, seen);
  }
  return o;
}

/** The first difference between a snapshot and the live value, as a path, or null. */
export function firstDifference(snap: unknown, v: unknown, path = '', depth = 0, seen = new Set<object>()): string | null {
  if (v === null || typeof v !== 'object') {
    if (typeof v === 'number' && typeof snap === 'number') return Object.is(v, snap) ? null : path || '<value>';
    return snap === v ? null : path || '<value>';
  }
  if (seen.has(v) || depth > MAX_DEPTH) return null;
  seen.add(v);
  if (ArrayBuffer.isView(v)) {
    const now = new Uint8Array(v.buffer, v.byteOffset, v.byteLength);
    const was = snap as Uint8Array;
    if (!(was instanceof Uint8Array) || was.length !== now.length) return `${path} (length)`;
    for (let k = 0; k < now.length; k++) if (now[k] !== was[k]) return `${path} (byte ${k})`;
    return null;
  }
  if (v instanceof ArrayBuffer) return null;
  if (v instanceof Date) return (snap as { date: number }).date === v.getTime() || (Number.isNaN(v.getTime()) && Number.isNaN((snap as { date: number }).date)) ? null : path;
  if (snap === v) return null; // beyond the snapshot depth
  if (Array.isArray(v)) {
    const was = snap as unknown[];
    if (!Array.isArray(was) || was.length !== v.length) return `${path} (length)`;
    for (let k = 0; k < v.length; k++) {
      const d = firstDifference(was[k], v[k], `${path}[${k}]`, depth + 1, seen);
      if (d) return d;
    }
    return null;
  }
  const was = snap as Record<string, unknown>;
  const keys = Object.keys(v);
  if (keys.length !== Object.keys(was).length) return `${path} (keys)`;
  for (const k of keys) {
    if (!(k in was)) return `${path}.${k} (added)`;
    if (depth === 0 && OUTPUT_KEYS.has(k)) continue; // an output buffer handed in through options
    let x: unknown;
    try {
      x = (v as Record<string, unknown>)[k];
    } catch {
      x = '<getter threw>';
    }
    const d = firstDifference(was[k], x, `${path}.${k}`, depth + 1, seen);
    if (d) return d;
  }
  return null;
}

function collectRefs(v: unknown, into: Set<object>, depth = 0): void {
  if (v === null || typeof v !== 'object' || into.has(v) || depth > MAX_DEPTH) return;
  into.add(v);
  if (ArrayBuffer.isView(v)) return;
  for (const k of Object.keys(v)) {
    try {
      collectRefs((v as Record<string, unknown>)[k], into, depth + 1);
    } catch {
      /* a throwing getter: ignore */
    }
  }
}

/**
 * The path of the first non-finite number in a result, skipping anything that is (part
 * of) an input: a check that hands its input back is not inventing a NaN.
 */
export function findNonFinite(v: unknown, inputs: Set<object>, path = '', depth = 0, seen = new Set<object>()): string | null {
  if (typeof v === 'number') return Number.isFinite(v) ? null : `${path || '<result>'} = ${v}`;
  if (v === null || typeof v !== 'object' || depth > MAX_DEPTH || inputs.has(v) || seen.has(v)) return null;
  seen.add(v);
  if (v instanceof Float64Array || v instanceof Float32Array) {
    for (let k = 0; k < v.length; k++) if (!Number.isFinite(v[k]!)) return `${path}[${k}] = ${v[k]}`;
    return null;
  }
  if (ArrayBuffer.isView(v) || v instanceof Date) return null;
  for (const k of Object.keys(v)) {
    let x: unknown;
    try {
      x = (v as Record<string, unknown>)[k];
    } catch {
      continue;
    }
    const d = findNonFinite(x, inputs, Array.isArray(v) ? `${path}[${k}]` : `${path}.${k}`, depth + 1, seen);
    if (d) return d;
  }
  return null;
}

/** The declared parameter names of a function or a class's constructor (destructured ones as `{…}`). */
export function parameterNames(f: Function): string[] {
  let src = Function.prototype.toString.call(f);
  if (/^class\b/.test(src)) {
    const at = src.search(/\bconstructor\s*\(/);
    if (at < 0) return [];
    src = src.slice(at);
  }
  const open = src.indexOf('(');
  if (open < 0) return [];
  let depth = 0;
  let cur = '';
  const parts: string[] = [];
  for (let k = open + 1; k < src.length; k++) {
    const c = src[k]!;
    if (c === '(' || c === '[' || c === '{') depth++;
    if (c === ')' || c === ']' || c === '}') {
      if (depth === 0) break;
      depth--;
    }
    if (c === ',' && depth === 0) {
      parts.push(cur);
      cur = '';
    } else cur += c;
  }
  if (cur.trim()) parts.push(cur);
  return parts.map((p) => {
    const t = p.trim().replace(/^\.\.\./, '');
    if (t.startsWith('{') || t.startsWith('[')) return '{…}';
    return t.split('=')[0]!.trim();
  });
}

/** True when the error's `parameter` starts with one of the declared names (or the function destructures). */
export function namesDeclaredParameter(parameter: string, declared: readonly string[]): boolean {
  if (declared.length === 0 || declared.includes('{…}')) return true;
  const root = parameter.split(/[.[ ×,]/)[0]!.trim();
  return declared.includes(root);
}

/** Soft findings (not failures): errors naming something that is not a declared parameter. */
export const namingFindings = new Map<string, string>();

/** Call `f` (as `new f(...)` when `construct`) and classify the outcome. */
export function judgeCall(
  name: string,
  f: Function,
  args: unknown[],
  policy: CallPolicy = {},
  construct = false,
  thisArg?: unknown,
): Outcome {
  if (TRACE) appendFileSync(TRACE, `${name}(${describeArgs(args).slice(0, 400)})\n`);
  const before = args.map((a, k) => (policy.outArgs?.includes(k) ? undefined : snapshot(a)));
  const t0 = performance.now();
  let result: unknown;
  let thrown: unknown;
  let threw = false;
  try {
    result = construct ? Reflect.construct(f, args) : Reflect.apply(f, thisArg, args);
  } catch (e) {
    threw = true;
    thrown = e;
  }
  const ms = performance.now() - t0;
  const limit = policy.timeLimitMs ?? 1500;
  if (ms > limit) return { kind: 'defect', why: `took ${ms.toFixed(0)} ms (> ${limit} ms)`, ms };
  for (let k = 0; k < args.length; k++) {
    if (policy.outArgs?.includes(k)) continue;
    const d = firstDifference(before[k], args[k]);
    if (d) return { kind: 'defect', why: `mutated argument ${k} at ${d}`, ms };
  }
  if (result instanceof Promise) {
    result.catch(() => undefined);
    return { kind: 'defect', why: 'returned a Promise (unexpected for a synchronous API)', ms };
  }
  if (threw) {
    if (policy.systemErrorsOk && typeof (thrown as { code?: unknown })?.code === 'string' && /^E[A-Z]+$/.test((thrown as { code: string }).code)) {
      return { kind: 'library-error', ms };
    }
    if (!isMeniscusError(thrown)) {
      const e = thrown as Error;
      return { kind: 'defect', why: `threw ${e?.name ?? typeof e}: ${String(e?.message ?? e).slice(0, 160)}`, ms };
    }
    const p = thrown.parameter;
    if (typeof p !== 'string' || p.length === 0 || !thrown.message.includes(p)) {
      if (!policy.freeNaming) return { kind: 'defect', why: `library error without a named parameter: ${thrown.message}`, ms };
    }
    if (!policy.freeNaming && typeof p === 'string' && !namesDeclaredParameter(p, parameterNames(f)) && !namingFindings.has(name)) {
      namingFindings.set(name, `"${thrown.message.slice(0, 120)}" (declared: ${parameterNames(f).join(', ')})`);
    }
    return { kind: 'library-error', parameter: p, ms };
  }
  if (!policy.nonFiniteOk) {
    const inputs = new Set<object>();
    for (const a of args) collectRefs(a, inputs);
    if (thisArg !== undefined) collectRefs(thisArg, inputs);
    const bad = findNonFinite(result, inputs);
    if (bad) return { kind: 'defect', why: `silent non-finite in the result: ${bad}`, ms };
  }
  return { kind: 'ok', ms };
}

/** Short printable form of arguments for a failure message. */
export function describeArgs(args: readonly unknown[]): string {
  const one = (v: unknown, depth: number): string => {
    if (typeof v === 'number') return Object.is(v, -0) ? '-0' : String(v);
    if (typeof v === 'string') return JSON.stringify(v.slice(0, 40));
    if (typeof v === 'bigint') return `${v}n`;
    if (typeof v === 'symbol' || typeof v === 'boolean' || v === undefined || v === null) return String(v);
    if (typeof v === 'function') return `fn:${v.name || 'anon'}`;
    if (ArrayBuffer.isView(v)) {
      const a = v as unknown as ArrayLike<number>;
      return `${v.constructor.name}[${Array.from({ length: Math.min(a.length, 6) }, (_, k) => a[k]).join(',')}${a.length > 6 ? `,…(${a.length})` : ''}]`;
    }
    if (v instanceof Date) return `Date(${v.getTime()})`;
    if (depth > 2) return '…';
    if (Array.isArray(v)) return `[${v.slice(0, 9).map((x) => one(x, depth + 1)).join(', ')}${v.length > 9 ? ', …' : ''}]`;
    const ctor = (v as object).constructor?.name;
    return `${ctor && ctor !== 'Object' ? ctor : ''}{${Object.keys(v as object)
      .slice(0, 8)
      .map((k) => `${k}: ${one((v as Record<string, unknown>)[k], depth + 1)}`)
      .join(', ')}}`;
  };
  return args.map((a) => one(a, 0)).join(', ');
}
