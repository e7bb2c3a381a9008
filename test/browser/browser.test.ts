/**
 * The ESM build in a real browser: bundle dist/index.js with a small scenario, load it in
 * headless Chromium (Debian's package, driven by playwright-core), run the scenario in the
 * page and compare its numbers with the same scenario run by Node on the same build.
 *
 * Needs `npm run build` first and a Chromium binary (MENISCUS_CHROMIUM, else `chromium`
 * on the PATH). It fails — it never skips — when either is missing.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { build } from 'esbuild';
import { chromium } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { compareResults, runScenario, type ScenarioModule } from './scenario.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, '..', '..');

function chromiumPath(): string {
  const env = process.env.MENISCUS_CHROMIUM;
  if (env) return env;
  try {
    return execFileSync('which', ['chromium'], { encoding: 'utf8' }).trim();
  } catch {
    throw new Error('Chromium not found: install Debian\'s "chromium" package or set MENISCUS_CHROMIUM');
  }
}

describe('the ESM build in headless Chromium', () => {
  it('runs the scenario in a page and agrees with Node', async () => {
    const dist = join(root, 'dist', 'index.js');
    if (!existsSync(dist)) throw new Error('dist/index.js is missing: run `npm run build` before `npm run test:browser`');
    const bundled = await build({
      entryPoints: [join(here, 'page-entry.ts')],
      bundle: true,
      format: 'esm',
      platform: 'browser',
      target: 'es2022',
      write: false,
      logLevel: 'silent',
    });
    const code = bundled.outputFiles[0]!.text;
    expect(code).not.toMatch(/require\(["']node:/);

    const browser = await chromium.launch({
      executablePath: chromiumPath(),
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--no-first-run',
        '--disable-quic',
      ],
    });
    try {
      const page = await browser.newPage();
      const errors: string[] = [];
      page.on('pageerror', (e) => errors.push(String(e)));
      await page.setContent('<!doctype html><html><head><meta charset="utf-8"></head><body></body></html>');
      await page.addScriptTag({ content: code, type: 'module' });
      await page.waitForFunction(() => (globalThis as { __meniscusDone?: boolean }).__meniscusDone === true, undefined, {
        timeout: 60_000,
      });
      const fromPage = await page.evaluate(() => (globalThis as { __meniscusResult?: unknown }).__meniscusResult);
      expect(errors).toEqual([]);
      const mod = (await import(pathToFileURL(dist).href)) as ScenarioModule;
      const fromNode = runScenario(mod);
      const diff = compareResults(fromNode, fromPage as ReturnType<typeof runScenario>);
      expect(diff.keys).toEqual(Object.keys(fromNode).sort());
      console.log('largest relative difference, browser vs Node, per output:', diff.perKey);
      // The seeded generator and the rendered sensor frame are integer-driven and must be
      // bit-identical. Chromium's V8 is newer than Node 20's and its Math.sin/exp/pow may
      // differ in the last bit, so the heights agree to rounding (relative to their
      // scale), and the corrected image, whose rasteriser decides which mesh triangle
      // owns a pixel centre, to 1e-4 of its scale (a pixel centre lying on an edge to
      // within rounding may be sampled from the neighbouring triangle).
      expect(diff.perKey.draws).toBe(0);
      expect(diff.perKey.frame).toBe(0);
      expect(diff.perKey.spotsMatched).toBe(0);
      expect(diff.perKey.height).toBeLessThan(1e-12);
      expect(diff.perKey.corrected).toBeLessThan(1e-4);
    } finally {
      await browser.close();
    }
  });
});
