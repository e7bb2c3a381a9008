/**
 * NumPy `.npz` archives (Node only): a ZIP file whose members are `.npy` files, one per
 * named array, as `numpy.savez` and `numpy.savez_compressed` write them and `numpy.load`
 * reads them. Written with no dependency beyond Node's own `zlib`.
 *
 * Writing uses plain ZIP (no ZIP64), stored or deflated members, a fixed timestamp
 * (1980-01-01 00:00) so that the same arrays always give the same bytes. Reading accepts
 * stored and deflated members, with or without ZIP64 size fields.
 *
 * @module
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { deflateRawSync, inflateRawSync } from 'node:zlib';
import { checkBoolean, checkOptions, rangeError, typeError } from '../core/index.js';
import { NPY_MAX_ELEMENTS, decodeNpy, encodeNpy } from './npy-codec.js';
import type { NpyArrayInput, NpyDecoded, NpyEncodeOptions } from './npy-codec.js';

let CRC_TABLE: Uint32Array | undefined;

/**
 * The CRC-32 of a byte string (the ZIP / PNG / IEEE 802.3 polynomial 0xEDB88320,
 * reflected, initial and final XOR 0xFFFFFFFF).
 *
 * @param bytes - Data.
 * @returns The checksum as an unsigned 32-bit integer.
 * @see PKWARE, "APPNOTE.TXT — .ZIP File Format Specification", version 6.3.10, section
 *   4.4.7; ISO/IEC 15948:2004 (PNG), annex D.
 * @example
 * ```ts
 * crc32(new TextEncoder().encode('123456789')); // 0xcbf43926
 * ```
 */
export function crc32(bytes: Uint8Array): number {
  if (!(bytes instanceof Uint8Array)) typeError('crc32', 'bytes', bytes, 'a Uint8Array');
  let table = CRC_TABLE;
  if (table === undefined) {
    table = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      table[n] = c >>> 0;
    }
    CRC_TABLE = table;
  }
  let c = 0xffffffff;
  for (let k = 0; k < bytes.length; k++) c = table[(c ^ bytes[k]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** Options for {@link encodeNpz} and {@link writeNpz}. */
export interface NpzWriteOptions extends NpyEncodeOptions {
  /** Deflate the members (as `numpy.savez_compressed`). @defaultValue false */
  compress?: boolean;
}

const NAME_RE = /^[A-Za-z_][A-Za-z0-9_.-]{0,127}$/;
const MAX_ZIP32 = 0xffffffff;
const DOS_DATE_1980 = (0 << 9) | (1 << 5) | 1;

/**
 * Encode named arrays as `.npz` bytes. Member `name` is stored as `name.npy`, so
 * `numpy.load(f)[name]` gives the array back.
 *
 * @param arrays - Arrays by name (letters, digits, `_`, `.`, `-`; not starting with a digit).
 * @param options - See {@link NpzWriteOptions}.
 * @returns The archive's bytes.
 * @throws {@link core!MeniscusRangeError} for a bad name or an archive too large for plain ZIP
 *   (4 GiB); everything {@link encodeNpy} throws for a bad array.
 * @see PKWARE, "APPNOTE.TXT — .ZIP File Format Specification", 6.3.10, sections 4.3.7
 *   (local header), 4.3.12 (central directory), 4.3.16 (end record); NumPy `numpy.savez`.
 * @example
 * ```ts
 * const zip = encodeNpz({ height: gridToNpy(h), mask: maskToNpy(m, w, hgt, { dtype: 'bool' }) });
 * ```
 */
export function encodeNpz(arrays: Readonly<Record<string, NpyArrayInput>>, options?: NpzWriteOptions): Uint8Array {
  const fn = 'encodeNpz';
  if (arrays === null || typeof arrays !== 'object' || Array.isArray(arrays)) typeError(fn, 'arrays', arrays, 'an object of named arrays');
  const o = checkOptions(fn, options);
  const compress = o.compress === undefined ? false : checkBoolean(fn, 'options.compress', o.compress);
  const npyOptions: NpyEncodeOptions = {};
  if (o.byteOrder !== undefined) npyOptions.byteOrder = o.byteOrder;
  if (o.version !== undefined) npyOptions.version = o.version;
  const enc = new TextEncoder();
  const parts: Uint8Array[] = [];
  const central: Uint8Array[] = [];
  let offset = 0;
  const names = Object.keys(arrays);
  for (const name of names) {
    if (!NAME_RE.test(name)) rangeError(fn, 'arrays', name, 'member names of letters, digits, "_", "." or "-", not starting with a digit');
    const raw = encodeNpy(arrays[name]!, npyOptions);
    const data = compress ? new Uint8Array(deflateRawSync(raw)) : raw;
    const crc = crc32(raw);
    const fname = enc.encode(`${name}.npy`);
    if (raw.length > MAX_ZIP32 || offset + 30 + fname.length + data.length > MAX_ZIP32) {
      rangeError(fn, 'arrays', name, 'an archive under 4 GiB (ZIP64 is not written)');
    }
    const method = compress ? 8 : 0;
    const local = new Uint8Array(30 + fname.length);
    const lv = new DataView(local.buffer);
    lv.setUint32(0, 0x04034b50, true);
    lv.setUint16(4, 20, true); // version needed: 2.0
    lv.setUint16(6, 0, true); // flags
    lv.setUint16(8, method, true);
    lv.setUint16(10, 0, true); // time 00:00:00
    lv.setUint16(12, DOS_DATE_1980, true);
    lv.setUint32(14, crc, true);
    lv.setUint32(18, data.length, true);
    lv.setUint32(22, raw.length, true);
    lv.setUint16(26, fname.length, true);
    lv.setUint16(28, 0, true);
    local.set(fname, 30);
    const cd = new Uint8Array(46 + fname.length);
    const cv = new DataView(cd.buffer);
    cv.setUint32(0, 0x02014b50, true);
    cv.setUint16(4, (3 << 8) | 20, true); // made by: Unix, 2.0
    cv.setUint16(6, 20, true);
    cv.setUint16(8, 0, true);
    cv.setUint16(10, method, true);
    cv.setUint16(12, 0, true);
    cv.setUint16(14, DOS_DATE_1980, true);
    cv.setUint32(16, crc, true);
    cv.setUint32(20, data.length, true);
    cv.setUint32(24, raw.length, true);
    cv.setUint16(28, fname.length, true);
    cv.setUint16(30, 0, true); // extra
    cv.setUint16(32, 0, true); // comment
    cv.setUint16(34, 0, true); // disk
    cv.setUint16(36, 0, true); // internal attributes
    cv.setUint32(38, (0o100644 << 16) >>> 0, true); // external: regular file, rw-r--r--
    cv.setUint32(42, offset, true);
    cd.set(fname, 46);
    parts.push(local, data);
    central.push(cd);
    offset += local.length + data.length;
  }
  if (names.length > 0xffff) rangeError(fn, 'arrays', names.length, 'at most 65535 members');
  const cdSize = central.reduce((s, c) => s + c.length, 0);
  const end = new Uint8Array(22);
  const ev = new DataView(end.buffer);
  ev.setUint32(0, 0x06054b50, true);
  ev.setUint16(8, names.length, true);
  ev.setUint16(10, names.length, true);
  ev.setUint32(12, cdSize, true);
  ev.setUint32(16, offset, true);
  const out = new Uint8Array(offset + cdSize + end.length);
  let p = 0;
  for (const part of [...parts, ...central, end]) {
    out.set(part, p);
    p += part.length;
  }
  return out;
}

function u64(dv: DataView, at: number): number {
  const lo = dv.getUint32(at, true);
  const hi = dv.getUint32(at + 4, true);
  return hi * 0x100000000 + lo;
}

/**
 * Decode `.npz` bytes into named arrays (member `x.npy` becomes key `x`). Members that
 * are not `.npy` files are skipped.
 *
 * @param bytes - The archive.
 * @returns The arrays by name.
 * @throws {@link core!MeniscusRangeError} for a damaged or unsupported archive (encrypted
 *   members, methods other than stored and deflate, bad CRC, spanned archives) and for
 *   members that {@link decodeNpy} refuses.
 * @see PKWARE, "APPNOTE.TXT — .ZIP File Format Specification", 6.3.10, sections 4.3.12,
 *   4.3.14–4.3.16 and 4.5.3 (ZIP64 extra field).
 * @example
 * ```ts
 * const { height } = decodeNpz(readFileSync('frame.npz'));
 * ```
 */
export function decodeNpz(bytes: Uint8Array): Record<string, NpyDecoded> {
  const fn = 'decodeNpz';
  if (!(bytes instanceof Uint8Array)) typeError(fn, 'bytes', bytes, 'a Uint8Array');
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  // Find the end-of-central-directory record (it may be followed by a comment).
  let eocd = -1;
  for (let k = bytes.length - 22; k >= 0 && k >= bytes.length - 22 - 0xffff; k--) {
    if (dv.getUint32(k, true) === 0x06054b50) {
      eocd = k;
      break;
    }
  }
  if (eocd < 0) rangeError(fn, 'bytes', bytes, 'a ZIP archive (no end-of-central-directory record found)');
  let count = dv.getUint16(eocd + 10, true);
  let cdSize = dv.getUint32(eocd + 12, true);
  let cdOffset = dv.getUint32(eocd + 16, true);
  if (dv.getUint16(eocd + 4, true) !== 0 || dv.getUint16(eocd + 6, true) !== 0) {
    rangeError(fn, 'bytes', bytes, 'a single-disk ZIP archive (spanned archives are not supported)');
  }
  if (count === 0xffff || cdSize === MAX_ZIP32 || cdOffset === MAX_ZIP32) {
    // ZIP64 end-of-central-directory locator sits just before.
    const loc = eocd - 20;
    if (loc < 0 || dv.getUint32(loc, true) !== 0x07064b50) rangeError(fn, 'bytes', bytes, 'a ZIP64 locator before the end record');
    const rec = u64(dv, loc + 8);
    if (rec + 56 > bytes.length || dv.getUint32(rec, true) !== 0x06064b50) rangeError(fn, 'bytes', bytes, 'a ZIP64 end record');
    count = u64(dv, rec + 32);
    cdSize = u64(dv, rec + 40);
    cdOffset = u64(dv, rec + 48);
  }
  if (cdOffset + cdSize > bytes.length) rangeError(fn, 'bytes', bytes, 'a complete ZIP archive (central directory truncated)');
  const dec = new TextDecoder();
  const out: Record<string, NpyDecoded> = Object.create(null);
  const maxRaw = NPY_MAX_ELEMENTS * 8 + 0x10000;
  let p = cdOffset;
  for (let e = 0; e < count; e++) {
    if (p + 46 > bytes.length || dv.getUint32(p, true) !== 0x02014b50) rangeError(fn, 'bytes', bytes, `a central directory entry ${e}`);
    const flags = dv.getUint16(p + 8, true);
    const method = dv.getUint16(p + 10, true);
    const crc = dv.getUint32(p + 16, true);
    let csize = dv.getUint32(p + 20, true);
    let usize = dv.getUint32(p + 24, true);
    const nlen = dv.getUint16(p + 28, true);
    const xlen = dv.getUint16(p + 30, true);
    const clen = dv.getUint16(p + 32, true);
    let lho = dv.getUint32(p + 42, true);
    const name = dec.decode(bytes.subarray(p + 46, p + 46 + nlen));
    // ZIP64 extra field: the 64-bit values appear in this order for the 0xFFFFFFFF fields.
    let x = p + 46 + nlen;
    const xend = x + xlen;
    while (x + 4 <= xend) {
      const id = dv.getUint16(x, true);
      const sz = dv.getUint16(x + 2, true);
      if (id === 0x0001) {
        let q = x + 4;
        if (usize === MAX_ZIP32) (usize = u64(dv, q)), (q += 8);
        if (csize === MAX_ZIP32) (csize = u64(dv, q)), (q += 8);
        if (lho === MAX_ZIP32) lho = u64(dv, q);
      }
      x += 4 + sz;
    }
    p = xend + clen;
    if (flags & 1) rangeError(fn, 'bytes', name, 'an unencrypted member');
    if (!name.endsWith('.npy')) continue;
    if (method !== 0 && method !== 8) rangeError(fn, 'bytes', name, `a stored (0) or deflated (8) member (method ${method})`);
    if (usize > maxRaw) rangeError(fn, 'bytes', name, `a member of at most ${maxRaw} bytes`);
    if (lho + 30 > bytes.length || dv.getUint32(lho, true) !== 0x04034b50) rangeError(fn, 'bytes', name, 'a local file header where the directory points');
    const start = lho + 30 + dv.getUint16(lho + 26, true) + dv.getUint16(lho + 28, true);
    if (start + csize > bytes.length) rangeError(fn, 'bytes', name, `${csize} bytes of member data (truncated archive)`);
    const comp = bytes.subarray(start, start + csize);
    let raw: Uint8Array;
    if (method === 0) raw = comp;
    else {
      try {
        raw = new Uint8Array(inflateRawSync(comp, { maxOutputLength: Math.max(1, usize) }));
      } catch (err) {
        rangeError(fn, 'bytes', name, `a valid deflate stream (${(err as Error).message})`);
      }
    }
    if (raw.length !== usize) rangeError(fn, 'bytes', name, `${usize} bytes after decompression (got ${raw.length})`);
    if (crc32(raw) !== crc) rangeError(fn, 'bytes', name, 'a member whose CRC-32 matches the directory');
    const key = name.slice(0, -4);
    if (key in out) rangeError(fn, 'bytes', name, 'each member name once');
    out[key] = decodeNpy(raw);
  }
  return out;
}

/**
 * Write named arrays as an `.npz` file.
 *
 * @param path - File path (overwritten).
 * @param arrays - Arrays by name.
 * @param options - See {@link NpzWriteOptions}.
 * @returns The number of bytes written.
 * @throws Everything {@link encodeNpz} throws; the file system's error on failure.
 * @see NumPy `numpy.savez`, `numpy.load`.
 * @example
 * ```ts
 * import { writeNpz, gridToNpy } from 'meniscus/node';
 * writeNpz('frame.npz', { height: gridToNpy(h) }, { compress: true });
 * // Python: numpy.load('frame.npz')['height']
 * ```
 */
export function writeNpz(path: string, arrays: Readonly<Record<string, NpyArrayInput>>, options?: NpzWriteOptions): number {
  if (typeof path !== 'string' || path.length === 0) typeError('writeNpz', 'path', path, 'a non-empty file path string');
  const bytes = encodeNpz(arrays, options);
  writeFileSync(path, bytes);
  return bytes.length;
}

/**
 * Read an `.npz` file.
 *
 * @param path - File path.
 * @returns The arrays by name.
 * @throws Everything {@link decodeNpz} throws; the file system's error on failure.
 * @see NumPy `numpy.load`.
 * @example
 * ```ts
 * import { readNpz } from 'meniscus/node';
 * const arrays = readNpz('frame.npz');
 * ```
 */
export function readNpz(path: string): Record<string, NpyDecoded> {
  if (typeof path !== 'string' || path.length === 0) typeError('readNpz', 'path', path, 'a non-empty file path string');
  return decodeNpz(readFileSync(path));
}
