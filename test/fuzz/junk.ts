/**
 * Random and malformed inputs: wrong types, wrong lengths, NaN and infinities, empty and
 * absurd sizes, degenerate geometry, plus a few well-formed library objects (cameras,
 * surfaces, lights, sensor geometry) so that the generic layer reaches past the first
 * check of functions that take them.
 */
import fc from 'fast-check';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readdirSync, readFileSync } from 'node:fs';
import { SRC } from './exports.js';

/** A scratch folder for functions that take a file path. */
export const SCRATCH = mkdtempSync(join(tmpdir(), 'meniscus-fuzz-'));

/** Option names the library reads (`'options.<name>'` in its messages), for random options objects. */
export const OPTION_KEYS: readonly string[] = (() => {
  const keys = new Set<string>(['out', 'mask', 'seed', 'width', 'height']);
  const walk = (d: string): void => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (p.endsWith('.ts')) for (const m of readFileSync(p, 'utf8').matchAll(/'options\.([A-Za-z]+)/g)) keys.add(m[1]!);
    }
  };
  walk(SRC);
  return [...keys].sort();
})();

const NUMBERS = [NaN, Infinity, -Infinity, 0, -0, -1, 1, 0.5, 2, 3, 7, 1e-300, 1e308, -1e308, 2 ** 31, 2 ** 53, 1e9, 65536, 65537, 1e12];

/** Unusual primitives. */
export const primitive = fc.constantFrom<unknown>(
  undefined,
  null,
  ...NUMBERS,
  'x',
  '',
  'pinhole',
  'little',
  true,
  false,
  1n,
  Symbol('junk'),
);

const anyDouble = fc.double();
const smallDouble = fc.oneof(fc.double({ min: -10, max: 10, noNaN: true }), fc.constantFrom(NaN, Infinity, -Infinity, 0, -0));

/** Typed arrays of small, odd lengths and odd contents. */
export const typedArray: fc.Arbitrary<unknown> = fc.oneof(
  fc.array(smallDouble, { maxLength: 13 }).map((a) => Float64Array.from(a)),
  fc.array(smallDouble, { maxLength: 13 }).map((a) => Float32Array.from(a)),
  fc.array(fc.integer({ min: 0, max: 255 }), { maxLength: 40 }).map((a) => Uint8Array.from(a)),
  fc.array(fc.integer({ min: -3, max: 12 }), { maxLength: 13 }).map((a) => Int32Array.from(a)),
  fc.constantFrom(new Float64Array(0), new Uint8Array(0)),
);

/** Byte streams that start like the files the node area reads, then go wrong. */
export const fileBytes: fc.Arbitrary<Uint8Array> = fc
  .tuple(
    fc.constantFrom(
      [],
      [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0], // .npy magic, version 1.0
      [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 2, 0],
      [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], // PNG signature
      [0x50, 0x4b, 0x03, 0x04], // zip local header
      [0x50, 0x4b, 0x05, 0x06], // zip end of central directory
    ),
    fc.array(fc.integer({ min: 0, max: 255 }), { maxLength: 64 }),
  )
  .map(([head, tail]) => Uint8Array.from([...head, ...tail]));

const smallSide = fc.integer({ min: 1, max: 5 });
const hugeSide = fc.constantFrom(65536, 65537, 1e6, 2 ** 31, 1e12, -1, 0, 2.5, NaN);

/** Grids: valid small ones, holes, wrong lengths, absurd sizes, missing fields. */
export const gridLike: fc.Arbitrary<unknown> = fc.oneof(
  fc.record({ w: smallSide, h: smallSide, nan: fc.boolean(), dx: fc.constantFrom(1, 0.01, 0, -1, NaN) }).map(({ w, h, nan, dx }) => {
    const data = new Float64Array(w * h).map((_, k) => Math.sin(k));
    if (nan) data[0] = NaN;
    return { width: w, height: h, data, dx, dy: dx === 0.01 ? 0.02 : 1, x0: 0, y0: 0 };
  }),
  fc.record({ w: smallSide, h: smallSide }).map(({ w, h }) => ({ width: w, height: h, data: new Float64Array(w * h + 1), dx: 1, dy: 1, x0: 0, y0: 0 })),
  fc.record({ w: hugeSide, h: hugeSide }).map(({ w, h }) => ({ width: w, height: h, data: new Float64Array(4), dx: 1, dy: 1, x0: 0, y0: 0 })),
  fc.record({ w: hugeSide, h: hugeSide }).map(({ w, h }) => ({ width: w, height: h })), // a GridSpec, absurd
  fc.record({ w: smallSide, h: smallSide }).map(({ w, h }) => ({ width: w, height: h, dx: 0.1 })), // a GridSpec, fine
  fc.constantFrom(Object.freeze({ width: 3 }), Object.freeze({ data: new Float64Array(9) })),
);

/** Images: valid small ones, NaN pixels, wrong lengths, absurd sizes. */
export const imageLike: fc.Arbitrary<unknown> = fc.oneof(
  fc.record({ w: smallSide, h: smallSide, c: fc.constantFrom(1, 3, 4), nan: fc.boolean() }).map(({ w, h, c, nan }) => {
    const data = new Float32Array(w * h * c).map((_, k) => (k % 7) / 7);
    if (nan) data[data.length - 1] = NaN;
    return { width: w, height: h, channels: c, data };
  }),
  fc.record({ w: hugeSide, h: hugeSide }).map(({ w, h }) => ({ width: w, height: h, channels: 1, data: new Float32Array(4) })),
  fc.record({ w: smallSide, h: smallSide }).map(({ w, h }) => ({ width: w, height: h, channels: 5, data: new Float32Array(w * h * 5) })),
  fc.constant({ width: 2, height: 2, channels: 1, data: new Float64Array(4) }),
);

/** Well-formed library objects, built once from the library itself (each in a try: an area may be mid-change). */
export const LIBRARY_SAMPLES: unknown[] = [];

/** Register library objects (called by the suite after loading the areas). */
export function addLibrarySamples(build: () => unknown[]): void {
  try {
    for (const s of build()) if (s !== undefined) LIBRARY_SAMPLES.push(s);
  } catch {
    /* an area that does not build samples yet */
  }
}

const librarySample: fc.Arbitrary<unknown> = fc.constant(null).chain(() =>
  LIBRARY_SAMPLES.length ? fc.constantFrom(...LIBRARY_SAMPLES) : fc.constant(undefined),
);

const shortArray: fc.Arbitrary<unknown> = fc.oneof(
  fc.array(anyDouble, { maxLength: 10 }),
  fc.tuple(smallDouble, smallDouble, smallDouble),
  fc.tuple(smallDouble, smallDouble),
  fc.array(smallDouble, { minLength: 9, maxLength: 9 }),
  fc.constantFrom(...[[0, 0, 0], [0, 0, 1], [0, 0, -1], [1, 0, 0, 0], [1, 0, 0, 0, 1, 0, 0, 0, 1], [[1, 2, 3]], ['a', 'b', 'c'], [undefined, 1, 2]].map((a) => Object.freeze(a))),
);

const dateLike = fc.oneof(fc.date({ noInvalidDate: true }), fc.constant(new Date(NaN)), fc.constant(new Date(8.64e15)));

const callbacks = fc.constantFrom<unknown>(
  () => 0,
  () => NaN,
  (x: number) => x,
  () => undefined,
  () => 1,
);

/** A leaf value: anything but a nested options object. */
export const leaf: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: primitive },
  { weight: 2, arbitrary: anyDouble },
  { weight: 1, arbitrary: fc.integer({ min: -3, max: 40 }) },
  { weight: 2, arbitrary: shortArray },
  { weight: 2, arbitrary: typedArray },
  { weight: 1, arbitrary: dateLike },
  { weight: 1, arbitrary: callbacks },
  { weight: 2, arbitrary: gridLike },
  { weight: 1, arbitrary: imageLike },
  { weight: 1, arbitrary: fileBytes },
  { weight: 2, arbitrary: librarySample },
  { weight: 1, arbitrary: fc.constantFrom(Object.freeze({}), Object.freeze({ x: NaN }), Object.freeze(Object.create(null) as object)) },
);

/** A random options object built from the option names the library reads. */
export const optionsObject: fc.Arbitrary<unknown> = fc.dictionary(fc.constantFrom(...OPTION_KEYS), leaf, { maxKeys: 4 });

/** Any junk argument. */
export const junk: fc.Arbitrary<unknown> = fc.oneof({ weight: 6, arbitrary: leaf }, { weight: 2, arbitrary: optionsObject });

/** Junk for a parameter that is a file path: scratch-folder paths (existing or not) and junk. */
export const pathJunk: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(join(SCRATCH, 'a.npy'), join(SCRATCH, 'b.png'), join(SCRATCH, 'c.npz'), join(SCRATCH, 'dir'), join(SCRATCH, 'missing', 'x.json'), SCRATCH, ''),
  leaf,
);

/** Junk arguments for a function with these declared parameter names. */
export function argsFor(names: readonly string[], arity: number): fc.Arbitrary<unknown[]> {
  const n = Math.max(names.length, arity);
  const per = (k: number): fc.Arbitrary<unknown> => {
    const nm = names[k] ?? '';
    // argument-check helpers take the caller's function and parameter names first
    if (names[0] === 'fn' && (nm === 'fn' || nm === 'parameter')) return fc.constantFrom('someFn', 'options.x', '');
    if (/path|dir$|^dir|file/i.test(nm)) return pathJunk;
    if (/options|spec|params|settings/i.test(nm)) return fc.oneof({ weight: 3, arbitrary: optionsObject }, { weight: 1, arbitrary: leaf });
    return junk;
  };
  const full = fc.tuple(...Array.from({ length: n }, (_, k) => per(k)));
  return fc.oneof(
    { weight: 8, arbitrary: full },
    { weight: 1, arbitrary: full.map((a) => a.slice(0, Math.max(0, n - 1))) }, // one argument missing
    { weight: 1, arbitrary: fc.tuple(full, junk).map(([a, x]) => [...a, x]) }, // one too many
  );
}
