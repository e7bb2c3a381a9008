/**
 * Determinism: every seeded function gives bit-identical results when called twice with
 * the same seed in one thread, and in a fresh worker thread; a different seed changes them.
 */
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { digest, resultBytes, seededCases } from './seeded.js';

const SEED = 12345;

describe('fuzz: determinism of seeded functions', () => {
  const first = seededCases(SEED);
  const second = seededCases(SEED);
  const other = seededCases(SEED + 1);

  for (const name of Object.keys(first)) {
    it(`${name}: same seed, same bytes; another seed, other bytes`, () => {
      const a = resultBytes(first[name]!());
      const b = resultBytes(second[name]!());
      expect(a.length).toBeGreaterThan(0);
      expect(Buffer.from(b).equals(Buffer.from(a))).toBe(true);
      expect(Buffer.from(resultBytes(other[name]!())).equals(Buffer.from(a))).toBe(false);
    });
  }

  it('a worker thread gives the same bytes as this thread', async () => {
    const here: Record<string, string> = {};
    for (const [name, run] of Object.entries(seededCases(SEED))) here[name] = digest(run());
    const there = await new Promise<Record<string, string>>((resolve, reject) => {
      // the worker loads the TypeScript twin through tsx's programmatic loader
      const tsxDir = dirname(createRequire(import.meta.url).resolve('tsx/package.json'));
      const api = pathToFileURL(join(tsxDir, 'dist/esm/api/index.mjs')).href;
      const entry = new URL('./determinism-worker.ts', import.meta.url).href;
      const code = `import(${JSON.stringify(api)}).then(({ tsImport }) => tsImport(${JSON.stringify(entry)}, ${JSON.stringify(entry)}))`;
      const w = new Worker(code, { eval: true, workerData: { seed: SEED } });
      w.once('message', (m) => {
        resolve(m as Record<string, string>);
        void w.terminate();
      });
      w.once('error', reject);
    });
    expect(there).toEqual(here);
  });
});
