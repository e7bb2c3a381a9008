/**
 * Picture benchmarks (no peer case in the peers script). `viz.colorize`: an N × N height
 * map through the viridis table into a linear RGB image. Error: the largest difference of
 * the last pixel from the table's top entry (0 when the lookup is right).
 */
import type { BenchCase } from '../case.js';
import { gridFromFunction } from '../../src/core/index.js';
import { colorizeGrid, getColormap } from '../../src/viz/index.js';

export const cases: BenchCase[] = [
  {
    name: 'viz.colorize',
    size: 1024,
    quickSize: 64,
    prepare(n: number) {
      const g = gridFromFunction({ width: n, height: n, dx: 0.001 }, (x, y) => x + y);
      const top = getColormap('viridis').linear.subarray(765, 768);
      return {
        run: () => colorizeGrid(g, { yUp: false }),
        error(result: unknown) {
          const d = (result as { image: { data: Float32Array } }).image.data;
          const k = d.length - 3;
          return Math.max(Math.abs(d[k]! - top[0]!), Math.abs(d[k + 1]! - top[1]!), Math.abs(d[k + 2]! - top[2]!));
        },
        notes: (ms: number) => `${((n * n) / (ms / 1000) / 1e6).toFixed(1)} Msamples/s`,
      };
    },
  },
];
