/**
 * Bench cases of the waves area.
 *
 * waves.synthesize: as the peers script: an N × N linear random sea (JONSWAP with
 * α 0.0081, peak period 1.2 s, γ 3.3, deep-water gravity waves with g 9.81, half-plane
 * cos² spreading), 0.5 mm spacing, fixed amplitudes with random phases (seed 5), height
 * and both slopes by inverse FFT, spectrum preparation included in the timed work.
 * error: |Hs of the field / expected Hs − 1| (a sanity figure for this realisation).
 * Timed after five untimed calls (the steady state of a per-frame caller).
 */
import type { BenchCase } from '../case.js';
import { cosSquaredSpreading, jonswapSpectrumFunction, prepareRandomSea, significantWaveHeight } from '../../src/waves/index.js';
import type { RandomSea, SeaFrame } from '../../src/waves/index.js';

export const cases: BenchCase[] = [
  {
    name: 'waves.synthesize',
    size: 1024,
    quickSize: 64,
    warmup: 5,
    prepare(n: number) {
      const g = 9.81;
      const sea = {
        frequencySpectrum: jonswapSpectrumFunction({ peakOmega: (2 * Math.PI) / 1.2, alpha: 0.0081, gamma: 3.3, gravity: g }),
        spreading: (t: number) => cosSquaredSpreading(t),
        dispersion: { surfaceTension: 0, gravity: g },
      };
      let last: RandomSea | undefined;
      return {
        run(): SeaFrame {
          last = prepareRandomSea({ width: n, height: n, dx: 0.0005 }, sea, { seed: 5, amplitudes: 'fixed', requirePeakResolved: false });
          return last.frame(0);
        },
        error(result: unknown): number {
          const f = result as SeaFrame;
          return Math.abs(significantWaveHeight(f.height) / last!.expected.significantHeight - 1);
        },
      };
    },
  },
];
