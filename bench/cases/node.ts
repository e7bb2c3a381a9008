/**
 * Node I/O benchmarks (no peer case in the peers script). `npy.roundtrip`: encode an
 * N × N float64 grid as big-endian `.npy` bytes (the byte-swapping path) and decode it;
 * `png.grid16`: a grid as a 16-bit grey PNG in memory and back through the decoder.
 * Error: the largest absolute difference after the round trip.
 */
import type { BenchCase } from '../case.js';
import { createImage, gridFromFunction } from '../../src/core/index.js';
import { decodeNpy, decodePng, encodeNpy, encodePng, gridToNpy } from '../../src/node/index.js';

export const cases: BenchCase[] = [
  {
    name: 'npy.roundtrip',
    size: 1024,
    quickSize: 64,
    prepare(n: number) {
      const g = gridFromFunction({ width: n, height: n, dx: 0.001 }, (x, y) => Math.sin(40 * x) * Math.cos(30 * y));
      const arr = gridToNpy(g);
      return {
        run: () => decodeNpy(encodeNpy(arr, { byteOrder: 'big' })),
        error(result: unknown) {
          const d = (result as { data: Float64Array }).data;
          let e = 0;
          for (let k = 0; k < d.length; k++) e = Math.max(e, Math.abs(d[k]! - g.data[k]!));
          return e;
        },
        notes: (ms: number) => `${((n * n * 8 * 2) / (ms / 1000) / 1e6).toFixed(0)} MB/s (encode + decode)`,
      };
    },
  },
  {
    name: 'png.grid16',
    size: 1024,
    quickSize: 64,
    iterations: 3,
    prepare(n: number) {
      const img = createImage(n, n, 1);
      for (let k = 0; k < n * n; k++) img.data[k] = (k % 65536) / 65535;
      return {
        run: () => decodePng(encodePng(img, { bitDepth: 16 }).png),
        error(result: unknown) {
          const d = (result as { data: Float32Array }).data;
          let e = 0;
          for (let k = 0; k < d.length; k++) e = Math.max(e, Math.abs(d[k]! - img.data[k]!));
          return e;
        },
      };
    },
  },
];
