/**
 * A small end-to-end scenario run identically in Node and in the browser. It takes the
 * library as an argument so that both sides run the very same built code.
 */
import type * as Meniscus from '../../src/index.js';

export type ScenarioModule = typeof Meniscus;
export type ScenarioResult = Record<string, number[]>;

export function runScenario(m: ScenarioModule): ScenarioResult {
  const rng = m.createRng(2026);
  const draws = Array.from({ length: 16 }, () => rng.normal());
  return { draws };
}

export function compareResults(a: ScenarioResult, b: ScenarioResult): { keys: string[]; maxRelative: number } {
  const keys = Object.keys(b).sort();
  let maxRelative = 0;
  for (const k of Object.keys(a)) {
    const x = a[k]!;
    const y = b[k];
    if (!y || y.length !== x.length) return { keys, maxRelative: Infinity };
    for (let i = 0; i < x.length; i++) {
      const d = Math.abs(x[i]! - y[i]!) / Math.max(1e-300, Math.abs(x[i]!), Math.abs(y[i]!));
      if (!(d <= maxRelative)) maxRelative = Number.isNaN(d) ? Infinity : Math.max(maxRelative, d);
    }
  }
  return { keys, maxRelative };
}
