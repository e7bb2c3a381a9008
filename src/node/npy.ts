/**
 * Reading and writing NumPy `.npy` files on disk (Node only). The format work is done by
 * the platform-neutral codec in `npy-codec.ts`.
 *
 * @module
 */
import { closeSync, fstatSync, openSync, readSync, writeFileSync } from 'node:fs';
import { rangeError, typeError } from '../core/index.js';
import { decodeNpy, encodeNpy, parseNpyHeader } from './npy-codec.js';
import type { NpyArrayInput, NpyDecodeOptions, NpyDecoded, NpyEncodeOptions } from './npy-codec.js';

function checkPath(fn: string, path: unknown): string {
  if (typeof path !== 'string' || path.length === 0) typeError(fn, 'path', path, 'a non-empty file path string');
  return path;
}

/**
 * Read an `.npy` file. The header is read and checked first, so a file whose shape is
 * too large is refused before its data are read.
 *
 * @param path - File path.
 * @param options - See {@link NpyDecodeOptions}.
 * @returns The decoded array.
 * @throws {@link core!MeniscusRangeError} for anything {@link decodeNpy} refuses (bad magic,
 *   malformed header, unsupported type, truncated data, oversized shape).
 * @throws The file system's error when the file cannot be opened.
 * @see NEP 1, "A simple file format for NumPy arrays".
 * @example
 * ```ts
 * import { readNpy, npyToGrid } from 'meniscus/node';
 * const height = npyToGrid(readNpy('height.npy'), { dx: 0.002 });
 * ```
 */
export function readNpy(path: string, options?: NpyDecodeOptions): NpyDecoded {
  const fn = 'readNpy';
  checkPath(fn, path);
  const fd = openSync(path, 'r');
  try {
    const size = fstatSync(fd).size;
    // Preamble: magic (6) + version (2) + length (2 or 4).
    const pre = new Uint8Array(Math.min(size, 12));
    readSync(fd, pre, 0, pre.length, 0);
    if (pre.length < 10) return decodeNpy(pre, options); // reports the truncation
    const major = pre[6];
    const headerLen = major === 1 ? pre[8]! | (pre[9]! << 8) : (pre[8]! | (pre[9]! << 8) | (pre[10]! << 16)) + (pre[11] ?? 0) * 0x1000000;
    const headEnd = (major === 1 ? 10 : 12) + headerLen;
    const head = new Uint8Array(Math.min(size, headEnd));
    readSync(fd, head, 0, head.length, 0);
    const h = parseNpyHeader(head); // refuses bad magic, headers and shapes early
    const itemSize = Number(/\d+$/.exec(h.descr)![0]);
    const want = h.dataOffset + h.count * itemSize;
    if (size > want && options?.trailingBytes !== 'ignore') {
      // let the codec word the error, without reading a possibly huge file
      rangeError(fn, 'path', path, `exactly ${want} bytes for shape (${h.shape.join(', ')}) of ${h.descr}; the file has ${size}`);
    }
    const all = new Uint8Array(Math.min(size, want));
    let off = 0;
    while (off < all.length) {
      const n = readSync(fd, all, off, all.length - off, off);
      if (n <= 0) break;
      off += n;
    }
    return decodeNpy(all.subarray(0, off), options);
  } finally {
    closeSync(fd);
  }
}

/**
 * Write an array as an `.npy` file that `numpy.load` reads (and that matches NumPy's
 * own bytes for the same array).
 *
 * @param path - File path (overwritten).
 * @param array - The array (see {@link encodeNpy}).
 * @param options - See {@link NpyEncodeOptions}.
 * @returns The number of bytes written.
 * @throws Everything {@link encodeNpy} throws; the file system's error on failure.
 * @see NEP 1, "A simple file format for NumPy arrays".
 * @example
 * ```ts
 * import { writeNpy, gridToNpy } from 'meniscus/node';
 * writeNpy('height.npy', gridToNpy(height));
 * // Python: h = numpy.load('height.npy')
 * ```
 */
export function writeNpy(path: string, array: NpyArrayInput, options?: NpyEncodeOptions): number {
  checkPath('writeNpy', path);
  const bytes = encodeNpy(array, options);
  writeFileSync(path, bytes);
  return bytes.length;
}
