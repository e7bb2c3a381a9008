import { readFileSync, readdirSync } from 'node:fs';
import { join, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  NPY_MAX_ELEMENTS,
  decodeNpy,
  encodeNpy,
  npyDescr,
  npyToCOrder,
  parseNpyHeader,
  type NpyDtype,
  type NpyTypedArray,
} from '../../src/node/index.js';

const FIX = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'npy');

interface Fixture {
  file: string;
  descr: string;
  shape: number[];
  fortranOrder: boolean;
  version: string;
}
const manifest = JSON.parse(readFileSync(join(FIX, 'manifest.json'), 'utf8')) as { fixtures: Fixture[] };

const DTYPE_OF: Record<string, NpyDtype> = {
  f4: 'float32',
  f8: 'float64',
  i1: 'int8',
  u1: 'uint8',
  i2: 'int16',
  u2: 'uint16',
  i4: 'int32',
  u4: 'uint32',
  b1: 'bool',
};
const CTOR: Record<NpyDtype, new (n: number) => NpyTypedArray> = {
  float32: Float32Array,
  float64: Float64Array,
  int8: Int8Array,
  uint8: Uint8Array,
  int16: Int16Array,
  uint16: Uint16Array,
  int32: Int32Array,
  uint32: Uint32Array,
  bool: Uint8Array,
};

/** The same value rule as test/fixtures/npy/make_fixtures.py, by C-order flat index k. */
function fixtureValues(dtype: NpyDtype, n: number): NpyTypedArray {
  const a = new CTOR[dtype](n);
  for (let k = 0; k < n; k++) {
    let v: number;
    switch (dtype) {
      case 'float32':
      case 'float64':
        v = (k - 7) * 0.1;
        break;
      case 'uint8':
        v = (k * 37 + 11) % 256;
        break;
      case 'int8':
        v = ((k * 37 + 11) % 256) - 128;
        break;
      case 'uint16':
        v = (k * 4099 + 3) % 65536;
        break;
      case 'uint32':
        v = Number((BigInt(k) * 2654435761n) % 4294967296n);
        break;
      case 'int16':
        v = k * 1237 - 20000;
        break;
      case 'int32':
        v = k * 123457 - 1000000;
        break;
      case 'bool':
        v = k % 3 !== 0 ? 1 : 0;
        break;
    }
    a[k] = v;
  }
  return a;
}

/** C-order data → Fortran-order data for the given shape (test-side reference). */
function cToF(c: NpyTypedArray, shape: number[]): NpyTypedArray {
  const f = new (c.constructor as new (n: number) => NpyTypedArray)(c.length);
  const nd = shape.length;
  const idx = new Array<number>(nd).fill(0);
  for (let k = 0; k < c.length; k++) {
    let rem = k;
    for (let d = nd - 1; d >= 0; d--) {
      idx[d] = rem % shape[d]!;
      rem = Math.floor(rem / shape[d]!);
    }
    let off = 0;
    let stride = 1;
    for (let d = 0; d < nd; d++) {
      off += idx[d]! * stride;
      stride *= shape[d]!;
    }
    f[off] = c[k]!;
  }
  return f;
}

function count(shape: number[]): number {
  return shape.reduce((a, b) => a * b, 1);
}

describe('encodeNpy / decodeNpy against files written by numpy (test/fixtures/npy, make_fixtures.py)', () => {
  it('covers the required cases', () => {
    const descrs = new Set(manifest.fixtures.map((f) => f.descr));
    for (const d of ['<f4', '>f4', '<f8', '>f8', '|u1', '<u2', '>u2']) expect(descrs).toContain(d);
    expect(manifest.fixtures.some((f) => f.version === '2.0')).toBe(true);
    expect(manifest.fixtures.some((f) => f.fortranOrder)).toBe(true);
    expect(manifest.fixtures.some((f) => f.shape.length === 0)).toBe(true);
    expect(manifest.fixtures.some((f) => f.shape.length === 3 && f.shape[2] === 3)).toBe(true);
  });

  for (const fx of manifest.fixtures) {
    const dtype = DTYPE_OF[fx.descr.slice(1)]!;
    const byteOrder = fx.descr[0] === '>' ? 'big' : 'little';
    it(`${fx.file}: byte-for-byte equal to numpy's file`, () => {
      const want = new Uint8Array(readFileSync(join(FIX, fx.file)));
      const c = fixtureValues(dtype, count(fx.shape));
      const data = fx.fortranOrder ? cToF(c, fx.shape) : c;
      const got = encodeNpy(
        { dtype, shape: fx.shape, fortranOrder: fx.fortranOrder, data },
        { byteOrder, version: fx.version === '2.0' ? '2.0' : 'auto' },
      );
      expect(Buffer.from(got).equals(Buffer.from(want))).toBe(true);
    });
    it(`${fx.file}: decodes to numpy's values, shape, order and version`, () => {
      const a = decodeNpy(new Uint8Array(readFileSync(join(FIX, fx.file))));
      expect(a.dtype).toBe(dtype);
      expect(a.shape).toEqual(fx.shape);
      expect(a.fortranOrder).toBe(fx.fortranOrder);
      expect(a.version).toBe(fx.version);
      expect(a.byteOrder).toBe(dtype === 'uint8' || dtype === 'int8' || dtype === 'bool' ? 'little' : byteOrder);
      const c = npyToCOrder(a);
      expect(Array.from(c.data)).toEqual(Array.from(fixtureValues(dtype, count(fx.shape))));
    });
  }
});

describe('header layout (NEP 1, "A simple file format for NumPy arrays")', () => {
  const bytes = encodeNpy({ shape: [3, 5], data: new Float64Array(15) });
  it('starts with the magic string \\x93NUMPY and version 1.0', () => {
    expect(Array.from(bytes.subarray(0, 8))).toEqual([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0]);
  });
  it('little-endian 2-byte header length; data start on a multiple of 64 (current numpy alignment)', () => {
    const hlen = bytes[8]! | (bytes[9]! << 8);
    expect((10 + hlen) % 64).toBe(0);
    expect(bytes.length - (10 + hlen)).toBe(15 * 8);
    expect(parseNpyHeader(bytes).dataOffset).toBe(10 + hlen);
  });
  it('header is the dict literal, padded with spaces and ended by a newline', () => {
    const h = parseNpyHeader(bytes);
    const text = Buffer.from(bytes.subarray(10, h.dataOffset)).toString('latin1');
    expect(text.startsWith("{'descr': '<f8', 'fortran_order': False, 'shape': (3, 5), }")).toBe(true);
    expect(text.endsWith('\n')).toBe(true);
    expect(/^\{[^}]*\} *\n$/.test(text)).toBe(true);
  });
  it('version 2.0 has a 4-byte length and the same alignment', () => {
    const b = encodeNpy({ shape: [4], data: new Uint16Array(4) }, { version: '2.0' });
    expect(b[6]).toBe(2);
    const hlen = b[8]! | (b[9]! << 8) | (b[10]! << 16) | (b[11]! << 24);
    expect((12 + hlen) % 64).toBe(0);
  });
  it('dtype descriptors as numpy spells them (dtype.str)', () => {
    expect(npyDescr('float64')).toBe('<f8');
    expect(npyDescr('float32', 'big')).toBe('>f4');
    expect(npyDescr('uint8', 'big')).toBe('|u1');
    expect(npyDescr('bool')).toBe('|b1');
    expect(npyDescr('uint16', 'big')).toBe('>u2');
    expect(npyDescr('int32')).toBe('<i4');
  });
  it('auto version picks 2.0 only when the header exceeds 65535 bytes', () => {
    // 64 axes of size 1 keep the header small: still 1.0
    const a = encodeNpy({ shape: new Array(64).fill(1), data: new Float32Array(1) });
    expect(a[6]).toBe(1);
  });
});

describe('round trips (write → read), every dtype, order, byte order and version', () => {
  const dtypes: NpyDtype[] = ['float32', 'float64', 'int8', 'uint8', 'int16', 'uint16', 'int32', 'uint32', 'bool'];
  it('decode(encode(a)) equals a', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...dtypes),
        fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 0, maxLength: 4 }),
        fc.boolean(),
        fc.constantFrom('little' as const, 'big' as const),
        fc.constantFrom('1.0' as const, '2.0' as const, 'auto' as const),
        fc.integer({ min: 0, max: 1_000_000 }),
        (dtype, shape, fortranOrder, byteOrder, version, seed) => {
          const n = count(shape);
          const data = new CTOR[dtype](n);
          for (let k = 0; k < n; k++) {
            const r = Math.sin(seed + k * 12.9898) * 43758.5453;
            const u = r - Math.floor(r);
            data[k] = dtype === 'bool' ? (u > 0.5 ? 1 : 0) : dtype.startsWith('float') ? (u - 0.5) * 1e3 : Math.floor(u * 256);
          }
          const bytes = encodeNpy({ dtype, shape, fortranOrder, data }, { byteOrder, version });
          const back = decodeNpy(bytes);
          expect(back.dtype).toBe(dtype);
          expect(back.shape).toEqual(shape);
          expect(back.fortranOrder).toBe(fortranOrder);
          expect(back.version).toBe(version === '2.0' ? '2.0' : '1.0');
          expect(Array.from(back.data)).toEqual(Array.from(data));
          expect(parseNpyHeader(bytes).dataOffset % 64).toBe(0);
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });
  it('keeps NaN, ±Infinity and -0 bit for bit in both byte orders', () => {
    const d = new Float64Array([NaN, Infinity, -Infinity, -0, 5e-324]);
    for (const byteOrder of ['little', 'big'] as const) {
      const b = decodeNpy(encodeNpy({ shape: [5], data: d }, { byteOrder })).data as Float64Array;
      expect(Buffer.from(b.buffer).equals(Buffer.from(d.buffer))).toBe(true);
    }
  });
  it('encodes typed-array views with a non-zero byte offset correctly', () => {
    const base = new Float32Array([9, 1, 2, 3, 9]);
    const view = base.subarray(1, 4);
    expect(Array.from(decodeNpy(encodeNpy({ shape: [3], data: view })).data)).toEqual([1, 2, 3]);
  });
  it('does not mutate its input', () => {
    const d = new Uint16Array([1, 2, 258]);
    encodeNpy({ shape: [3], data: d }, { byteOrder: 'big' });
    expect(Array.from(d)).toEqual([1, 2, 258]);
  });
});

describe('npyToCOrder', () => {
  it('matches the numpy Fortran fixtures to the C-order rule (3-D too)', () => {
    const a = decodeNpy(new Uint8Array(readFileSync(join(FIX, 'u2_be_f_2x3x4.npy'))));
    expect(a.fortranOrder).toBe(true);
    const c = npyToCOrder(a);
    expect(c.fortranOrder).toBe(false);
    expect(Array.from(c.data)).toEqual(Array.from(fixtureValues('uint16', 24)));
    expect(Array.from(a.data)).toEqual(Array.from(cToF(fixtureValues('uint16', 24), [2, 3, 4])));
  });
  it('returns a C-order array unchanged', () => {
    const a = decodeNpy(encodeNpy({ shape: [2, 2], data: new Float64Array(4) }));
    expect(npyToCOrder(a)).toBe(a);
  });
});

function header(text: string, version = 1): Uint8Array {
  const h = Buffer.from(text, 'latin1');
  const pre = version === 1 ? 10 : 12;
  const out = new Uint8Array(pre + h.length);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, version, 0]);
  out[8] = h.length & 0xff;
  out[9] = h.length >> 8;
  out.set(h, pre);
  return out;
}
function withData(text: string, nbytes: number): Uint8Array {
  const h = header(text);
  const out = new Uint8Array(h.length + nbytes);
  out.set(h);
  return out;
}

describe('bad input: clear errors', () => {
  const good = encodeNpy({ shape: [2, 3], data: new Float64Array(6) });
  const msg = (f: () => unknown) => {
    try {
      f();
    } catch (e) {
      return e as Error;
    }
    throw new Error('did not throw');
  };

  it('truncated data names the expected and present byte counts', () => {
    const e = msg(() => decodeNpy(good.subarray(0, good.length - 5)));
    expect(e).toBeInstanceOf(MeniscusRangeError);
    expect(e.message).toMatch(/48 data bytes.*truncated: only 43 present/);
  });
  it('truncated preamble and truncated header', () => {
    expect(msg(() => decodeNpy(good.subarray(0, 7))).message).toMatch(/truncated/);
    expect(msg(() => decodeNpy(good.subarray(0, 40))).message).toMatch(/truncated/);
  });
  it('bad magic', () => {
    const b = good.slice();
    b[0] = 0x50;
    expect(msg(() => decodeNpy(b)).message).toMatch(/magic string/);
  });
  it('unknown version', () => {
    const b = good.slice();
    b[6] = 4;
    expect(msg(() => decodeNpy(b)).message).toMatch(/version 1\.0, 2\.0 or 3\.0/);
  });
  it('trailing bytes are refused unless allowed', () => {
    const b = new Uint8Array(good.length + 8);
    b.set(good);
    expect(msg(() => decodeNpy(b)).message).toMatch(/extra/);
    expect(decodeNpy(b, { trailingBytes: 'ignore' }).byteLength).toBe(good.length);
  });
  for (const [file, re] of [
    ['c16.npy', /complex/],
    ['object.npy', /object/],
    ['record.npy', /record/],
    ['f2.npy', /one of/],
    ['datetime.npy', /type string/],
  ] as const) {
    it(`numpy-written unsupported array ${file} is refused`, () => {
      const e = msg(() => decodeNpy(new Uint8Array(readFileSync(join(FIX, 'unsupported', file)))));
      expect(e).toBeInstanceOf(MeniscusRangeError);
      expect(e.message).toMatch(re);
    });
  }
  it('all unsupported fixtures are covered', () => {
    expect(readdirSync(join(FIX, 'unsupported')).sort()).toEqual(['c16.npy', 'datetime.npy', 'f2.npy', 'object.npy', 'record.npy']);
  });
  it('malformed headers (no evaluation: code in the header is just a syntax error)', () => {
    const cases: [string, RegExp][] = [
      ["{'descr': '<f8', 'fortran_order': False}\n", /'descr', 'fortran_order' and 'shape'/],
      ["{'descr': '<f8', 'fortran_order': False, 'shape': (2,), 'extra': 1}\n", /only the keys/],
      ["{'descr': '<f8', 'fortran_order': False, 'shape': (2)}\n", /one-element shape/],
      ["{'descr': '<f8', 'fortran_order': 0, 'shape': (2,)}\n", /string, True, False or a tuple/],
      ["{'descr': '<f8', 'fortran_order': False, 'shape': (-2,)}\n", /non-negative integer/],
      ["{'descr': '<f8', 'fortran_order': False, 'shape': (2.5,)}\n", /"," or "\)"/],
      ["{'descr': '<f8', 'fortran_order': False, 'shape': (2,)}", /newline/],
      ["{'descr': __import__('os').system('x'), 'fortran_order': False, 'shape': (2,)}\n", /string, True, False/],
      ["{'descr': '<f8', 'descr': '<f8', 'fortran_order': False, 'shape': (2,)}\n", /repeats/],
      ["{'descr': '<f8', 'fortran_order': False, 'shape': (2,)} x\n", /only spaces/],
      ["{'descr': '=f8', 'fortran_order': False, 'shape': (2,)}\n", /explicit byte order/],
      ["{'descr': '|f8', 'fortran_order': False, 'shape': (2,)}\n", /byte order/],
      ["['descr', '<f8']\n", /dict literal/],
    ];
    for (const [text, re] of cases) {
      const e = msg(() => decodeNpy(withData(text, 16)));
      expect(e, text).toBeInstanceOf(MeniscusRangeError);
      expect(e.message, text).toMatch(re);
    }
  });
  it('accepts what numpy may also write: double quotes, no trailing comma, Python 2 "L" suffix, 16-byte alignment', () => {
    const a = decodeNpy(withData('{"descr": "<u2", "fortran_order": False, "shape": (2L, 3L)}   \n', 12));
    expect(a.shape).toEqual([2, 3]);
    expect(a.dtype).toBe('uint16');
  });
  it('reads version 3.0 (UTF-8 header, 4-byte length; numpy.lib.format documentation)', () => {
    const text = "{'descr': '<f4', 'fortran_order': False, 'shape': (2,), }      \n";
    const h = header(text, 3);
    const out = new Uint8Array(h.length + 8);
    out.set(h);
    new DataView(out.buffer).setFloat32(h.length, 1.5, true);
    new DataView(out.buffer).setFloat32(h.length + 4, -2, true);
    const a = decodeNpy(out);
    expect(a.version).toBe('3.0');
    expect(Array.from(a.data)).toEqual([1.5, -2]);
  });
  it('huge shapes are refused from the header alone (core LIMITS)', () => {
    const e = msg(() => parseNpyHeader(header("{'descr': '<f8', 'fortran_order': False, 'shape': (100000, 100000), }\n")));
    expect(e).toBeInstanceOf(MeniscusRangeError);
    expect(e.message).toContain(String(NPY_MAX_ELEMENTS));
    expect(msg(() => parseNpyHeader(header("{'descr': '<f8', 'fortran_order': False, 'shape': (99999999999999999999,), }\n"))).message).toMatch(/2\^53/);
  });
  it('encode: shape/length mismatch, bad shape, unsupported array, dtype mismatch, bad bool', () => {
    expect(msg(() => encodeNpy({ shape: [2, 2], data: new Float64Array(3) }))).toBeInstanceOf(MeniscusTypeError);
    expect(msg(() => encodeNpy({ shape: [2, 2], data: new Float64Array(3) })).message).toMatch(/4 elements/);
    expect(msg(() => encodeNpy({ shape: [-1], data: new Float64Array(0) }))).toBeInstanceOf(MeniscusRangeError);
    expect(msg(() => encodeNpy({ shape: [2], data: new Uint8ClampedArray(2) as never }))).toBeInstanceOf(MeniscusTypeError);
    expect(msg(() => encodeNpy({ shape: [2], data: new BigInt64Array(2) as never }))).toBeInstanceOf(MeniscusTypeError);
    expect(msg(() => encodeNpy({ dtype: 'float32', shape: [2], data: new Float64Array(2) }))).toBeInstanceOf(MeniscusTypeError);
    expect(msg(() => encodeNpy({ dtype: 'bool', shape: [2], data: new Uint8Array([0, 2]) }))).toBeInstanceOf(MeniscusRangeError);
    expect(msg(() => encodeNpy({ shape: [1], data: new Float64Array(1) }, { byteOrder: 'middle' as never }))).toBeInstanceOf(MeniscusRangeError);
  });
  it('a bool array holding other bytes is refused', () => {
    const b = encodeNpy({ dtype: 'bool', shape: [2], data: new Uint8Array([1, 0]) });
    b[b.length - 1] = 7;
    expect(msg(() => decodeNpy(b)).message).toMatch(/boolean byte/);
  });
  it('non-Uint8Array input', () => {
    expect(msg(() => decodeNpy([1, 2, 3] as never))).toBeInstanceOf(MeniscusTypeError);
  });
});
