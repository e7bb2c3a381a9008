/**
 * Per-export rules of the fuzz suite: which arguments are outputs, which exports are
 * unchecked small-vector kernels, which are argument-check helpers, and the open
 * defects in areas that are still being written (reported, not fixed here).
 */
import fc from 'fast-check';
import type { CallPolicy } from './harness.js';
import { gridLike, junk, typedArray } from './junk.js';

/**
 * Small-vector kernels of core (`add`, `dot`, `mat3Mul` …) do not validate their
 * arguments, by design (they sit in hot loops). The suite feeds them well-typed tuples
 * with any numbers (NaN and infinities included) instead of junk, and checks they never
 * throw anything but the library's error and never touch their inputs.
 */
export const UNCHECKED_KERNELS = new Set([
  'add',
  'addScaled',
  'angleBetween',
  'cross',
  'dot',
  'norm',
  'normalize',
  'scale',
  'sub',
  'mat3Det',
  'mat3Mul',
  'mat3MulVec',
  'mat3Transpose',
  'mat3TransposeMulVec',
  'rotationAboutAxis',
  // scalar transfer functions, applied per pixel: defined on [0, 1] and continued outside
  'srgbEncode',
  'srgbDecode',
  'srgbByteToLinear',
]);

/** Argument-check helpers: they name whatever parameter they are told to name. */
const CHECK_HELPERS = /^(check[A-Z]|rangeError$|typeError$|describeValue$|isMeniscusError$|Meniscus(Range|Type)Error$)/;

/**
 * Open defects found by the suite in areas this suite may not edit; the generic layer
 * skips these exports and the report lists the failing case. Key: `area/name`.
 */
export const OPEN_DEFECTS: Readonly<Record<string, string>> = {
};

/** Methods of library objects with open defects (areas still being written): `Kind.method`. */
export const OPEN_METHOD_DEFECTS: Readonly<Record<string, string>> = {
};

/** Methods that are per-sample kernels (fed numbers only, NaN in gives NaN out). */
export const KERNEL_METHODS = /^(Rng\.(normal|uniform|random|nextUint32|fillNormal|fillUniform)|\{bounds,.*\}\.(height|gradient|heightGradient))$/;

/** Exports with process-level side effects (workers, stdio, exit codes): tested by their author, not fed junk here. */
export const SIDE_EFFECTS: Readonly<Record<string, string>> = {
  'node/runCli': 'runs the command line: files, stdio, exit codes',
  'node/startWorker': 'starts a worker thread from a script',
  'node/serveTasks': 'turns the current thread into a task server',
  'node/runTasks': 'starts worker threads',
  'node/createProgress': 'writes to a stream',
};

/** The policy of one export. */
export function policyFor(area: string, name: string, documentsNonFinite: boolean, firstParameter = ''): CallPolicy {
  return {
    // an error object carries the offending value as given
    nonFiniteOk: documentsNonFinite || UNCHECKED_KERNELS.has(name) || /Error$/.test(name),
    freeNaming: CHECK_HELPERS.test(name) || firstParameter === 'fn',
    timeLimitMs: 1500,
    ...(EXTRA[`${area}/${name}`] ?? {}),
  };
}

const EXTRA: Readonly<Record<string, CallPolicy>> = {};

const name = fc.constantFrom('someFn', 'options.x');
const num = fc.oneof(fc.double(), fc.constantFrom(-0, 2 ** 26, 2 ** 26 + 1, 2 ** 53));
const grid = fc.record({ w: fc.integer({ min: 1, max: 4 }), h: fc.integer({ min: 1, max: 4 }), dx: fc.constantFrom(1, 2) }).map(({ w, h, dx }) => ({
  width: w,
  height: h,
  data: new Float64Array(w * h),
  dx,
  dy: 1,
  x0: 0,
  y0: 0,
}));

/**
 * Core's argument-check helpers and error types are called by library code with the
 * caller's names and well-typed bounds; only the checked value is junk here.
 */
export const HELPER_ARGS: Readonly<Record<string, fc.Arbitrary<unknown[]>>> = {
  checkAllFinite: fc.tuple(name, name, fc.oneof(typedArray, fc.array(fc.double(), { maxLength: 5 }))),
  checkAllocation: fc.tuple(name, name, num),
  checkInRange: fc.tuple(name, name, junk, fc.constant(-1), fc.constant(1)),
  checkInteger: fc.tuple(name, name, junk, fc.constant(0), fc.constant(10)),
  checkMask: fc.tuple(name, name, junk, fc.constant(2), fc.constant(2)),
  checkOneOf: fc.tuple(name, name, junk, fc.constant(['a', 'b'])),
  checkOut: fc.tuple(name, name, junk, fc.constantFrom(0, 3)),
  checkFloat64Array: fc.tuple(name, name, junk, fc.constantFrom(1, 3)),
  checkSameShape: fc.tuple(name, name, grid, grid),
  checkGrid: fc.tuple(name, name, fc.oneof(gridLike, junk), fc.boolean()),
  rangeError: fc.tuple(name, name, junk, fc.constant('a number')),
  typeError: fc.tuple(name, name, junk, fc.constant('a number')),
  MeniscusRangeError: fc.tuple(fc.record({ fn: name, parameter: name, value: junk, expected: fc.constant('x') })),
  MeniscusTypeError: fc.tuple(fc.record({ fn: name, parameter: name, value: junk, expected: fc.constant('x') })),
};
