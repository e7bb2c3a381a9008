/**
 * An in-memory codec for NumPy `.npy` files (format versions 1.0, 2.0 and, for reading,
 * 3.0): bytes ↔ `{ dtype, shape, fortranOrder, data }`.
 *
 * This file is platform-neutral (no file system, no `Buffer`): it works on `Uint8Array`s
 * and could move to a platform-neutral area unchanged. File functions are in `npy.ts`.
 *
 * Layout (NEP 1): the magic string `\x93NUMPY`, one byte major and one byte minor
 * version, the header length as a little-endian unsigned integer (2 bytes in 1.0, 4 bytes
 * in 2.0 and 3.0), then the header: a Python dict literal with the keys `descr`,
 * `fortran_order` and `shape`, padded with spaces and ended with a newline so that the
 * data starts on a multiple of 64 bytes. The data follows, in the byte order named by
 * `descr`, in C (row-major) or Fortran (column-major) order.
 *
 * The header parser is a small strict recogniser of exactly that dict (no evaluation of
 * any kind); anything else is refused with a {@link core!MeniscusRangeError} or
 * {@link core!MeniscusTypeError} that says what was wrong.
 *
 * @see NumPy Enhancement Proposal NEP 1, "A simple file format for NumPy arrays"
 *   (Kern, 2007), and the `numpy.lib.format` module documentation.
 * @module
 */
import { LIMITS, checkBoolean, checkOneOf, checkOptions, rangeError, typeError } from '../core/index.js';

/** The element types this codec reads and writes. */
export type NpyDtype = 'float32' | 'float64' | 'int8' | 'uint8' | 'int16' | 'uint16' | 'int32' | 'uint32' | 'bool';

/** The typed array that holds each {@link NpyDtype} (`bool` is a `Uint8Array` of 0 and 1). */
export type NpyTypedArray =
  | Float32Array
  | Float64Array
  | Int8Array
  | Uint8Array
  | Int16Array
  | Uint16Array
  | Int32Array
  | Uint32Array;

/** Byte order of the elements in a file. */
export type NpyByteOrder = 'little' | 'big';

/** A format version this codec understands. */
export type NpyVersion = '1.0' | '2.0' | '3.0';

/** An n-dimensional array as stored in an `.npy` file. */
export interface NpyArray {
  /** Element type. */
  readonly dtype: NpyDtype;
  /** Shape, outermost axis first, as NumPy gives it (`[]` for a 0-d array). */
  readonly shape: readonly number[];
  /**
   * Whether `data` is in Fortran (column-major: first index fastest) rather than C
   * (row-major: last index fastest) order.
   */
  readonly fortranOrder: boolean;
  /** The elements in native byte order, in the order `fortranOrder` says. */
  readonly data: NpyTypedArray;
}

/** An array to encode; `dtype` and `fortranOrder` may be left out. */
export interface NpyArrayInput {
  /**
   * Element type. @defaultValue inferred from `data` (`Uint8Array` → `uint8`; give
   * `'bool'` explicitly to write a NumPy boolean array)
   */
  readonly dtype?: NpyDtype;
  /** Shape, outermost axis first; the product must equal `data.length`. */
  readonly shape: readonly number[];
  /** Data in Fortran order. @defaultValue false */
  readonly fortranOrder?: boolean;
  /** The elements. */
  readonly data: NpyTypedArray;
}

/** The parsed header of an `.npy` file. */
export interface NpyHeader {
  /** Format version of the file. */
  readonly version: NpyVersion;
  /** The `descr` string as written, e.g. `'<f8'`. */
  readonly descr: string;
  /** Element type. */
  readonly dtype: NpyDtype;
  /** Byte order of the stored elements (`little` for one-byte types). */
  readonly byteOrder: NpyByteOrder;
  /** The `fortran_order` flag. */
  readonly fortranOrder: boolean;
  /** The `shape` tuple. */
  readonly shape: readonly number[];
  /** Number of elements (product of `shape`; 1 for a 0-d array). */
  readonly count: number;
  /** Byte offset of the first data byte (magic + length field + header). */
  readonly dataOffset: number;
}

/** A decoded file: the array plus what the header said. */
export interface NpyDecoded extends NpyArray {
  /** Format version of the file. */
  readonly version: NpyVersion;
  /** Byte order the elements were stored in (they are returned in native order). */
  readonly byteOrder: NpyByteOrder;
  /** Bytes consumed: header plus data. */
  readonly byteLength: number;
}

/** Options for {@link encodeNpy}. */
export interface NpyEncodeOptions {
  /** Byte order to store multi-byte elements in. @defaultValue 'little' */
  byteOrder?: NpyByteOrder;
  /**
   * Format version. `'auto'` writes 1.0 unless the header is too long for its 2-byte
   * length field, then 2.0, as NumPy does. @defaultValue 'auto'
   */
  version?: '1.0' | '2.0' | 'auto';
}

/** Options for {@link decodeNpy}. */
export interface NpyDecodeOptions {
  /**
   * What to do with bytes after the data: `'error'` refuses them (they usually mean the
   * shape and the data disagree); `'ignore'` stops at the end of the data (several
   * arrays written one after another). @defaultValue 'error'
   */
  trailingBytes?: 'error' | 'ignore';
}

/**
 * The largest number of elements one array may have: four planes of
 * {@link core!LIMITS}.maxSamples (an RGBA image of the largest size).
 */
export const NPY_MAX_ELEMENTS = 4 * LIMITS.maxSamples;

const MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59]; // \x93NUMPY
const ALIGN = 64;
/** NumPy leaves room after the header so the growth axis can reach 21 digits. */
const GROWTH_AXIS_MAX_DIGITS = 21;
const MAX_NDIM = 64;

interface DtypeInfo {
  readonly kind: string;
  readonly size: number;
  readonly ctor: new (n: number) => NpyTypedArray;
}

const DTYPES: Readonly<Record<NpyDtype, DtypeInfo>> = {
  float32: { kind: 'f', size: 4, ctor: Float32Array },
  float64: { kind: 'f', size: 8, ctor: Float64Array },
  int8: { kind: 'i', size: 1, ctor: Int8Array },
  uint8: { kind: 'u', size: 1, ctor: Uint8Array },
  int16: { kind: 'i', size: 2, ctor: Int16Array },
  uint16: { kind: 'u', size: 2, ctor: Uint16Array },
  int32: { kind: 'i', size: 4, ctor: Int32Array },
  uint32: { kind: 'u', size: 4, ctor: Uint32Array },
  bool: { kind: 'b', size: 1, ctor: Uint8Array },
};

const NATIVE_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * The element type stored by a typed array (`Uint8Array` → `uint8`).
 *
 * @param data - A typed array.
 * @returns Its {@link NpyDtype}, or `undefined` for a type `.npy` files here do not carry.
 * @example
 * ```ts
 * npyDtypeOf(new Float32Array(4)); // "float32"
 * ```
 */
export function npyDtypeOf(data: unknown): NpyDtype | undefined {
  if (data instanceof Float64Array) return 'float64';
  if (data instanceof Float32Array) return 'float32';
  if (data instanceof Uint8ClampedArray) return undefined;
  if (data instanceof Uint8Array) return 'uint8';
  if (data instanceof Int8Array) return 'int8';
  if (data instanceof Uint16Array) return 'uint16';
  if (data instanceof Int16Array) return 'int16';
  if (data instanceof Uint32Array) return 'uint32';
  if (data instanceof Int32Array) return 'int32';
  return undefined;
}

/**
 * The NumPy type descriptor (`descr`) for an element type and byte order, as NumPy
 * writes it: `'<f8'`, `'>u2'`, `'|u1'`, `'|b1'`.
 *
 * @param dtype - Element type.
 * @param byteOrder - Byte order (ignored for one-byte types, which use `|`). @defaultValue 'little'
 * @returns The descriptor string.
 * @see NEP 1, "A simple file format for NumPy arrays": `descr` is `dtype.str`.
 * @example
 * ```ts
 * npyDescr('float64', 'big'); // ">f8"
 * ```
 */
export function npyDescr(dtype: NpyDtype, byteOrder: NpyByteOrder = 'little'): string {
  const known = typeof dtype === 'string' && Object.prototype.hasOwnProperty.call(DTYPES, dtype);
  const info = DTYPES[known ? dtype : checkOneOf('npyDescr', 'dtype', dtype, Object.keys(DTYPES) as NpyDtype[])];
  checkOneOf('npyDescr', 'byteOrder', byteOrder, ['little', 'big'] as const);
  const order = info.size === 1 ? '|' : byteOrder === 'big' ? '>' : '<';
  return `${order}${info.kind}${info.size}`;
}

function parseDescr(fn: string, descr: string): { dtype: NpyDtype; byteOrder: NpyByteOrder } {
  const m = /^([<>|=])([a-zA-Z])(\d+)$/.exec(descr);
  if (m === null) {
    if (/^[<>|=]?[OV]/.test(descr)) {
      rangeError(fn, 'header.descr', descr, 'a plain numeric type; object and void (record) arrays are not supported');
    }
    rangeError(fn, 'header.descr', descr, 'a NumPy type string such as "<f8" or "|u1"');
  }
  const [, order, kind, sizeText] = m;
  const size = Number(sizeText);
  const found = (Object.keys(DTYPES) as NpyDtype[]).find((k) => DTYPES[k].kind === kind && DTYPES[k].size === size);
  if (found === undefined) {
    let why = 'one of <f4 <f8 |i1 |u1 <i2 <u2 <i4 <u4 |b1 (either byte order)';
    if (kind === 'c') why = `a real type; complex arrays (${descr}) are not supported, ${why}`;
    else if (kind === 'O') why = `a numeric type; object arrays need Python's pickle and are not supported, ${why}`;
    rangeError(fn, 'header.descr', descr, why);
  }
  if (size > 1 && order === '|') rangeError(fn, 'header.descr', descr, 'a byte order "<" or ">" for a multi-byte type');
  if (order === '=') rangeError(fn, 'header.descr', descr, 'an explicit byte order "<", ">" or "|" (not the writer\'s native "=")');
  return { dtype: found, byteOrder: order === '>' && size > 1 ? 'big' : 'little' };
}

// ---------------------------------------------------------------------------------------
// Header recogniser: {'descr': <str>, 'fortran_order': <bool>, 'shape': <tuple of ints>}
// ---------------------------------------------------------------------------------------

type Literal = { kind: 'str'; value: string } | { kind: 'bool'; value: boolean } | { kind: 'tuple'; value: number[] };

class HeaderReader {
  pos = 0;
  constructor(
    private readonly fn: string,
    private readonly text: string,
  ) {}

  fail(expected: string): never {
    const near = this.text.slice(this.pos, this.pos + 24);
    return rangeError(this.fn, 'header', this.text.length > 120 ? this.text.slice(0, 117) + '...' : this.text, `${expected} at character ${this.pos} (near ${JSON.stringify(near)})`);
  }

  ws(): void {
    const t = this.text;
    while (this.pos < t.length) {
      const c = t.charCodeAt(this.pos);
      if (c === 0x20 || c === 0x09 || c === 0x0a || c === 0x0d) this.pos++;
      else break;
    }
  }

  peek(): string {
    return this.text.charAt(this.pos);
  }

  expect(ch: string, what: string): void {
    if (this.text.charAt(this.pos) !== ch) this.fail(what);
    this.pos++;
  }

  string(): string {
    const q = this.peek();
    if (q !== "'" && q !== '"') this.fail('a quoted string');
    const end = this.text.indexOf(q, this.pos + 1);
    if (end < 0) this.fail('a closing quote');
    const s = this.text.slice(this.pos + 1, end);
    if (s.includes('\\') || s.includes('\n')) this.fail('a plain string without escapes or line breaks');
    this.pos = end + 1;
    return s;
  }

  integer(): number {
    const m = /^(0|[1-9][0-9]*)L?/.exec(this.text.slice(this.pos, this.pos + 40));
    if (m === null) this.fail('a non-negative integer');
    const v = Number(m[1]);
    if (!Number.isSafeInteger(v)) this.fail('an integer below 2^53');
    this.pos += m[0].length;
    return v;
  }

  tuple(): number[] {
    this.expect('(', 'a tuple');
    const items: number[] = [];
    let trailingComma = false;
    this.ws();
    while (this.peek() !== ')') {
      items.push(this.integer());
      if (items.length > MAX_NDIM) this.fail(`at most ${MAX_NDIM} dimensions`);
      this.ws();
      trailingComma = false;
      if (this.peek() === ',') {
        this.pos++;
        trailingComma = true;
        this.ws();
      } else if (this.peek() !== ')') this.fail('"," or ")" in the shape tuple');
    }
    this.pos++;
    // In Python "(3)" is the integer 3, not a tuple: a one-element tuple needs its comma.
    if (items.length === 1 && !trailingComma) this.fail('a tuple; a one-element shape is written "(n,)"');
    return items;
  }

  literal(): Literal {
    const c = this.peek();
    if (c === "'" || c === '"') return { kind: 'str', value: this.string() };
    if (c === '(') return { kind: 'tuple', value: this.tuple() };
    if (c === '[') this.fail('a plain type string; record (structured) arrays, whose descr is a list, are not supported');
    if (this.text.startsWith('True', this.pos)) {
      this.pos += 4;
      return { kind: 'bool', value: true };
    }
    if (this.text.startsWith('False', this.pos)) {
      this.pos += 5;
      return { kind: 'bool', value: false };
    }
    return this.fail('a string, True, False or a tuple');
  }
}

function parseHeaderText(fn: string, text: string): { descr: string; fortranOrder: boolean; shape: number[] } {
  const r = new HeaderReader(fn, text);
  r.ws();
  r.expect('{', 'a dict literal "{"');
  const seen = new Map<string, Literal>();
  r.ws();
  while (r.peek() !== '}') {
    const key = r.string();
    if (key !== 'descr' && key !== 'fortran_order' && key !== 'shape') {
      r.fail(`only the keys 'descr', 'fortran_order', 'shape' (found ${JSON.stringify(key)})`);
    }
    if (seen.has(key)) r.fail(`each key once (${JSON.stringify(key)} repeats)`);
    r.ws();
    r.expect(':', '":" after a key');
    r.ws();
    seen.set(key, r.literal());
    r.ws();
    if (r.peek() === ',') {
      r.pos++;
      r.ws();
    } else if (r.peek() !== '}') r.fail('"," or "}" after a value');
  }
  r.pos++;
  r.ws();
  if (r.pos !== text.length) r.fail('only spaces after the dict');
  if (!text.endsWith('\n')) rangeError(fn, 'header', text.slice(-20), 'a header ending in a newline (NEP 1)');
  const descr = seen.get('descr');
  const fortran = seen.get('fortran_order');
  const shape = seen.get('shape');
  if (descr === undefined || fortran === undefined || shape === undefined) {
    rangeError(fn, 'header', text.trim(), "a dict with the keys 'descr', 'fortran_order' and 'shape'");
  }
  if (descr.kind !== 'str') rangeError(fn, 'header.descr', descr.value, 'a type string such as "<f8"');
  if (fortran.kind !== 'bool') rangeError(fn, 'header.fortran_order', fortran.value, 'True or False');
  if (shape.kind !== 'tuple') rangeError(fn, 'header.shape', shape.value, 'a tuple of non-negative integers');
  return { descr: descr.value, fortranOrder: fortran.value, shape: shape.value };
}

function elementCount(fn: string, parameter: string, shape: readonly number[]): number {
  let count = 1;
  for (const n of shape) {
    count *= n;
    if (count > NPY_MAX_ELEMENTS) {
      rangeError(fn, parameter, shape, `a shape of at most ${NPY_MAX_ELEMENTS} elements (NPY_MAX_ELEMENTS, from LIMITS)`);
    }
  }
  return count;
}

function decodeLatin1(bytes: Uint8Array): string {
  let s = '';
  const CHUNK = 8192;
  for (let k = 0; k < bytes.length; k += CHUNK) {
    s += String.fromCharCode(...bytes.subarray(k, Math.min(bytes.length, k + CHUNK)));
  }
  return s;
}

/**
 * Parse and validate the header of an `.npy` file. Only the header bytes need be
 * present, so a file reader can check the shape before reading the data.
 *
 * @param bytes - The start of the file (at least up to the end of the header).
 * @returns The header.
 * @throws {@link core!MeniscusRangeError} for a bad magic string, an unknown version, a
 *   truncated or malformed header, an unsupported `descr` (complex, object, record,
 *   float16, …) or a shape above {@link NPY_MAX_ELEMENTS}.
 * @throws {@link core!MeniscusTypeError} when `bytes` is not a `Uint8Array`.
 * @see NEP 1, "A simple file format for NumPy arrays", sections "Format Specification"
 *   (version 1.0) and "Format Version 2.0"; version 3.0 (UTF-8 header) from the
 *   `numpy.lib.format` documentation.
 * @example
 * ```ts
 * const h = parseNpyHeader(bytes);
 * h.shape; // e.g. [480, 640]
 * ```
 */
export function parseNpyHeader(bytes: Uint8Array): NpyHeader {
  const fn = 'parseNpyHeader';
  if (!(bytes instanceof Uint8Array)) typeError(fn, 'bytes', bytes, 'a Uint8Array');
  return parseHeaderAt(fn, bytes);
}

function parseHeaderAt(fn: string, bytes: Uint8Array): NpyHeader {
  if (bytes.length < 10) rangeError(fn, 'bytes', bytes, 'an .npy file of at least 10 bytes (truncated: no complete preamble)');
  for (let k = 0; k < MAGIC.length; k++) {
    if (bytes[k] !== MAGIC[k]) {
      rangeError(fn, 'bytes', Array.from(bytes.subarray(0, 6)), 'an .npy file starting with the magic string \\x93NUMPY');
    }
  }
  const major = bytes[6]!;
  const minor = bytes[7]!;
  if (!((major === 1 || major === 2 || major === 3) && minor === 0)) {
    rangeError(fn, 'version', `${major}.${minor}`, 'format version 1.0, 2.0 or 3.0');
  }
  const version = `${major}.0` as NpyVersion;
  let headerLen: number;
  let start: number;
  if (major === 1) {
    headerLen = bytes[8]! | (bytes[9]! << 8);
    start = 10;
  } else {
    if (bytes.length < 12) rangeError(fn, 'bytes', bytes, 'an .npy file of at least 12 bytes (truncated: no complete preamble)');
    headerLen = (bytes[8]! | (bytes[9]! << 8) | (bytes[10]! << 16)) + bytes[11]! * 0x1000000;
    start = 12;
  }
  if (start + headerLen > bytes.length) {
    rangeError(fn, 'bytes', bytes, `a header of ${headerLen} bytes after the preamble (truncated: only ${bytes.length - start} present)`);
  }
  const hb = bytes.subarray(start, start + headerLen);
  let text: string;
  if (major === 3) {
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(hb);
    } catch {
      rangeError(fn, 'header', hb, 'a UTF-8 header (version 3.0)');
    }
  } else {
    text = decodeLatin1(hb);
  }
  const parsed = parseHeaderText(fn, text);
  const { dtype, byteOrder } = parseDescr(fn, parsed.descr);
  const count = elementCount(fn, 'header.shape', parsed.shape);
  return {
    version,
    descr: parsed.descr,
    dtype,
    byteOrder,
    fortranOrder: parsed.fortranOrder,
    shape: parsed.shape,
    count,
    dataOffset: start + headerLen,
  };
}

function bswap32(x: number): number {
  return ((x & 0xff) << 24) | ((x & 0xff00) << 8) | ((x >>> 8) & 0xff00) | (x >>> 24);
}

/** Reverse the bytes of every `size`-byte element in place. */
function swapBytes(u8: Uint8Array, size: number): void {
  const aligned = u8.byteOffset % 4 === 0 && u8.length % 4 === 0;
  if (size === 2) {
    if (u8.byteOffset % 2 === 0) {
      const w = new Uint16Array(u8.buffer, u8.byteOffset, u8.length >> 1);
      for (let k = 0; k < w.length; k++) {
        const x = w[k]!;
        w[k] = ((x & 0xff) << 8) | (x >>> 8);
      }
      return;
    }
    for (let k = 0; k + 1 < u8.length; k += 2) {
      const a = u8[k]!;
      u8[k] = u8[k + 1]!;
      u8[k + 1] = a;
    }
  } else if (size === 4 || size === 8) {
    if (aligned) {
      const w = new Uint32Array(u8.buffer, u8.byteOffset, u8.length >> 2);
      if (size === 4) {
        for (let k = 0; k < w.length; k++) w[k] = bswap32(w[k]!);
      } else {
        for (let k = 0; k + 1 < w.length; k += 2) {
          const lo = w[k]!;
          w[k] = bswap32(w[k + 1]!);
          w[k + 1] = bswap32(lo);
        }
      }
      return;
    }
    for (let k = 0; k + size - 1 < u8.length; k += size) {
      for (let a = 0; a < size >> 1; a++) {
        const t = u8[k + a]!;
        u8[k + a] = u8[k + size - 1 - a]!;
        u8[k + size - 1 - a] = t;
      }
    }
  }
}

/**
 * Decode an `.npy` file held in memory.
 *
 * The elements are copied into a new typed array in native byte order; the order of
 * the elements (C or Fortran) is kept as stored and reported in `fortranOrder` (see
 * {@link npyToCOrder}).
 *
 * @param bytes - The whole file.
 * @param options - See {@link NpyDecodeOptions}.
 * @returns The array and what its header said.
 * @throws {@link core!MeniscusRangeError} for everything {@link parseNpyHeader} refuses,
 *   for data shorter than the shape needs (a truncated file), for trailing bytes
 *   (unless allowed), and for a `bool` array holding bytes other than 0 and 1.
 * @throws {@link core!MeniscusTypeError} when `bytes` is not a `Uint8Array`.
 * @see NEP 1, "A simple file format for NumPy arrays".
 * @example
 * ```ts
 * const a = decodeNpy(encodeNpy({ shape: [2, 3], data: new Float64Array(6) }));
 * a.dtype; // "float64"
 * ```
 */
export function decodeNpy(bytes: Uint8Array, options?: NpyDecodeOptions): NpyDecoded {
  const fn = 'decodeNpy';
  if (!(bytes instanceof Uint8Array)) typeError(fn, 'bytes', bytes, 'a Uint8Array');
  const o = checkOptions(fn, options);
  const trailing = o.trailingBytes === undefined ? 'error' : checkOneOf(fn, 'options.trailingBytes', o.trailingBytes, ['error', 'ignore'] as const);
  const h = parseHeaderAt(fn, bytes);
  const info = DTYPES[h.dtype];
  const nbytes = h.count * info.size;
  const available = bytes.length - h.dataOffset;
  if (available < nbytes) {
    rangeError(
      fn,
      'bytes',
      bytes,
      `${nbytes} data bytes for shape (${h.shape.join(', ')}) of ${h.descr} (truncated: only ${available} present)`,
    );
  }
  if (available > nbytes && trailing === 'error') {
    rangeError(
      fn,
      'bytes',
      bytes,
      `exactly ${nbytes} data bytes for shape (${h.shape.join(', ')}) of ${h.descr}; found ${available - nbytes} extra (pass options.trailingBytes = 'ignore' to allow)`,
    );
  }
  const data = new info.ctor(h.count);
  const u8 = new Uint8Array(data.buffer, data.byteOffset, nbytes);
  u8.set(bytes.subarray(h.dataOffset, h.dataOffset + nbytes));
  if (info.size > 1 && (h.byteOrder === 'little') !== NATIVE_LITTLE) swapBytes(u8, info.size);
  if (h.dtype === 'bool') {
    for (let k = 0; k < u8.length; k++) {
      if (u8[k]! > 1) rangeError(fn, `data[${k}]`, u8[k], 'a boolean byte 0 or 1');
    }
  }
  return {
    dtype: h.dtype,
    shape: h.shape,
    fortranOrder: h.fortranOrder,
    data,
    version: h.version,
    byteOrder: h.byteOrder,
    byteLength: h.dataOffset + nbytes,
  };
}

function pythonTuple(shape: readonly number[]): string {
  if (shape.length === 0) return '()';
  if (shape.length === 1) return `(${shape[0]},)`;
  return `(${shape.join(', ')})`;
}

/**
 * The header dict text exactly as NumPy writes it (keys sorted, a trailing `", "`, and
 * spare spaces so that the growth axis can later reach 21 digits), before padding.
 */
function headerDict(descr: string, fortranOrder: boolean, shape: readonly number[]): string {
  let h = `{'descr': '${descr}', 'fortran_order': ${fortranOrder ? 'True' : 'False'}, 'shape': ${pythonTuple(shape)}, }`;
  if (shape.length > 0) {
    const growth = shape[fortranOrder ? shape.length - 1 : 0]!;
    h += ' '.repeat(Math.max(0, GROWTH_AXIS_MAX_DIGITS - String(growth).length));
  }
  return h;
}

function checkArrayInput(fn: string, array: NpyArrayInput): { dtype: NpyDtype; shape: number[]; fortranOrder: boolean; count: number } {
  if (array === null || typeof array !== 'object') typeError(fn, 'array', array, 'an object { shape, data, dtype?, fortranOrder? }');
  const inferred = npyDtypeOf(array.data);
  if (inferred === undefined) {
    typeError(fn, 'array.data', array.data, 'a Float32Array, Float64Array, Int8Array, Uint8Array, Int16Array, Uint16Array, Int32Array or Uint32Array');
  }
  let dtype: NpyDtype = inferred;
  if (array.dtype !== undefined) {
    dtype = checkOneOf(fn, 'array.dtype', array.dtype, Object.keys(DTYPES) as NpyDtype[]);
    const ok = dtype === inferred || (dtype === 'bool' && inferred === 'uint8');
    if (!ok) typeError(fn, 'array.data', array.data, `a typed array holding ${dtype} (array.dtype)`);
  }
  if (!Array.isArray(array.shape)) typeError(fn, 'array.shape', array.shape, 'an array of non-negative integers');
  if (array.shape.length > MAX_NDIM) rangeError(fn, 'array.shape', array.shape, `at most ${MAX_NDIM} dimensions`);
  for (let k = 0; k < array.shape.length; k++) {
    const n = array.shape[k];
    if (typeof n !== 'number' || !Number.isSafeInteger(n) || n < 0) {
      rangeError(fn, `array.shape[${k}]`, n, 'a non-negative integer');
    }
  }
  const count = elementCount(fn, 'array.shape', array.shape);
  if (count !== array.data.length) {
    typeError(fn, 'array.data', array.data, `${count} elements, the product of array.shape (${array.shape.join(', ')})`);
  }
  const fortranOrder = array.fortranOrder === undefined ? false : checkBoolean(fn, 'array.fortranOrder', array.fortranOrder);
  if (dtype === 'bool') {
    const d = array.data;
    for (let k = 0; k < d.length; k++) if (d[k] !== 0 && d[k] !== 1) rangeError(fn, `array.data[${k}]`, d[k], 'a boolean 0 or 1');
  }
  return { dtype, shape: array.shape.slice(), fortranOrder, count };
}

/**
 * Encode an array as an `.npy` file, byte for byte as NumPy's own writer lays it out
 * (the same header text, spare space and padding), so files can be compared exactly.
 *
 * @param array - The array: its typed array gives the element type; `shape` must
 *   multiply to its length; the data are taken in the order `fortranOrder` says.
 * @param options - See {@link NpyEncodeOptions}.
 * @returns The file's bytes (data start on a multiple of 64 bytes).
 * @throws {@link core!MeniscusTypeError} for an unsupported typed array, a shape that does
 *   not match the data, or a `dtype` that does not match the typed array.
 * @throws {@link core!MeniscusRangeError} for a bad shape entry, more than
 *   {@link NPY_MAX_ELEMENTS} elements, or a header too long for version 1.0 when
 *   `version: '1.0'` is forced.
 * @see NEP 1, "A simple file format for NumPy arrays" (header layout, 64-byte
 *   alignment in current NumPy, version 2.0 for headers over 65535 bytes).
 * @example
 * ```ts
 * const bytes = encodeNpy({ shape: [2, 2], data: new Float32Array([1, 2, 3, 4]) });
 * // np.load gives array([[1., 2.], [3., 4.]], dtype=float32)
 * ```
 */
export function encodeNpy(array: NpyArrayInput, options?: NpyEncodeOptions): Uint8Array {
  const fn = 'encodeNpy';
  const o = checkOptions(fn, options);
  const byteOrder = o.byteOrder === undefined ? 'little' : checkOneOf(fn, 'options.byteOrder', o.byteOrder, ['little', 'big'] as const);
  const versionOpt = o.version === undefined ? 'auto' : checkOneOf(fn, 'options.version', o.version, ['1.0', '2.0', 'auto'] as const);
  const { dtype, shape, fortranOrder, count } = checkArrayInput(fn, array);
  const info = DTYPES[dtype];
  const descr = npyDescr(dtype, byteOrder);
  const dict = headerDict(descr, fortranOrder, shape);
  const hlen = dict.length + 1; // + newline
  const pad = (pre: number) => ALIGN - ((pre + hlen) % ALIGN);
  let major = versionOpt === '2.0' ? 2 : 1;
  if (major === 1 && hlen + pad(10) > 0xffff) {
    if (versionOpt === '1.0') rangeError(fn, 'options.version', '1.0', `version 2.0 or 'auto' for a header of ${hlen} bytes (1.0 holds at most 65535)`);
    major = 2;
  }
  const pre = major === 1 ? 10 : 12;
  const padLen = pad(pre);
  const total = hlen + padLen;
  const dataOffset = pre + total;
  const nbytes = count * info.size;
  const out = new Uint8Array(dataOffset + nbytes);
  out.set(MAGIC, 0);
  out[6] = major;
  out[7] = 0;
  out[8] = total & 0xff;
  out[9] = (total >>> 8) & 0xff;
  if (major !== 1) {
    out[10] = (total >>> 16) & 0xff;
    out[11] = (total >>> 24) & 0xff;
  }
  let p = pre;
  for (let k = 0; k < dict.length; k++) out[p++] = dict.charCodeAt(k);
  out.fill(0x20, p, p + padLen);
  out[dataOffset - 1] = 0x0a;
  const src = array.data;
  const body = out.subarray(dataOffset);
  body.set(new Uint8Array(src.buffer, src.byteOffset, nbytes));
  if (info.size > 1 && (byteOrder === 'little') !== NATIVE_LITTLE) swapBytes(body, info.size);
  return out;
}

/**
 * The same array with its elements in C (row-major) order: a copy when the input is in
 * Fortran order, the input itself when it already is in C order.
 *
 * @param array - An array in either order.
 * @returns An array with `fortranOrder: false`.
 * @example
 * ```ts
 * const c = npyToCOrder(decodeNpy(bytes));
 * // c.data[r * cols + col] is element (r, col) of a 2-D array
 * ```
 */
export function npyToCOrder<T extends NpyArray>(array: T): T {
  const fn = 'npyToCOrder';
  if (array === null || typeof array !== 'object') typeError(fn, 'array', array, 'a decoded array { shape, data, fortranOrder }');
  if (!array.fortranOrder) return array;
  if (!Array.isArray(array.shape) || !ArrayBuffer.isView(array.data) || array.data instanceof DataView) {
    typeError(fn, 'array', array, 'a decoded array { shape: number[], data: typed array, fortranOrder }');
  }
  if (array.shape.reduce((a: number, b: unknown) => a * (typeof b === 'number' ? b : NaN), 1) !== array.data.length) {
    typeError(fn, 'array.shape', array.shape, `integer sizes whose product is data.length = ${array.data.length}`);
  }
  const shape = array.shape;
  const nd = shape.length;
  const src = array.data;
  const n = src.length;
  const dst = new (src.constructor as new (n: number) => NpyTypedArray)(n);
  if (nd <= 1 || n === 0) {
    dst.set(src as ArrayLike<number>);
  } else {
    // Fortran stride of axis k is the product of the sizes before it.
    const fStride = new Array<number>(nd);
    let s = 1;
    for (let k = 0; k < nd; k++) {
      fStride[k] = s;
      s *= shape[k]!;
    }
    const idx = new Array<number>(nd).fill(0);
    let f = 0;
    const last = nd - 1;
    const lastN = shape[last]!;
    const lastStride = fStride[last]!;
    for (let c = 0; c < n; ) {
      // innermost C axis is the last one: step through it in one go
      for (let t = 0; t < lastN; t++) dst[c++] = src[f + t * lastStride]!;
      // odometer over the remaining axes
      let k = last - 1;
      while (k >= 0) {
        idx[k]!++;
        f += fStride[k]!;
        if (idx[k]! < shape[k]!) break;
        f -= idx[k]! * fStride[k]!;
        idx[k] = 0;
        k--;
      }
    }
  }
  return { ...array, fortranOrder: false, data: dst };
}
