#!/usr/bin/env node
// The published package, checked as consumers see it:
//  1. `npm pack` the package;
//  2. publint on the tarball's contents and @arethetypeswrong/cli (node16 ESM and CJS,
//     bundler resolution);
//  3. a scratch project installs the tarball and imports every subpath from ESM and CJS;
//  4. each subpath bundled (minified, dependencies included) against the size budget in
//     scripts/bundle-budget.json.
// Needs `npm run build` first. Exits non-zero on any failure.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { gzipSync } from 'node:zlib';
import { build } from 'esbuild';

const root = resolve('.');
const pkg = JSON.parse(readFileSync('package.json', 'utf8'));
const subpaths = Object.keys(pkg.exports).filter((k) => k !== './package.json');
const run = (cmd, args, opts = {}) => execFileSync(cmd, args, { stdio: 'inherit', ...opts });
const work = mkdtempSync(join(tmpdir(), 'meniscus-pack-'));
let failed = false;

try {
  // 1. pack
  const packOut = execFileSync('npm', ['pack', '--json', '--pack-destination', work], { encoding: 'utf8' });
  const tarball = join(work, JSON.parse(packOut)[0].filename);
  console.log(`packed ${tarball}`);

  // 2. lint the package and its types
  run('npx', ['--no-install', 'publint', '--strict', root]);
  run('npx', ['--no-install', 'attw', tarball, '--profile', 'node16', '--format', 'table-flipped']);

  // 3. a scratch consumer, ESM and CJS
  const proj = join(work, 'consumer');
  run('mkdir', ['-p', proj]);
  writeFileSync(join(proj, 'package.json'), JSON.stringify({ name: 'consumer', private: true, version: '0.0.0' }));
  run('npm', ['install', '--no-audit', '--no-fund', '--ignore-scripts', tarball], { cwd: proj });
  const names = subpaths.map((s) => (s === '.' ? 'meniscus' : `meniscus/${s.slice(2)}`));
  const esm = names.map((n, k) => `import * as m${k} from '${n}';`).join('\n') +
    `\nconst counts = [${names.map((_, k) => `Object.keys(m${k}).length`).join(', ')}];\n` +
    `if (counts.some((c) => c === 0)) { console.error('empty subpath', counts); process.exit(1); }\n` +
    `console.log('ESM imports ok:', ${JSON.stringify(names)}.map((n, k) => n + ' (' + counts[k] + ')').join(', '));\n`;
  const cjs = `const names = ${JSON.stringify(names)};\n` +
    `const counts = names.map((n) => Object.keys(require(n)).length);\n` +
    `if (counts.some((c) => c === 0)) { console.error('empty subpath', counts); process.exit(1); }\n` +
    `console.log('CJS requires ok:', names.map((n, k) => n + ' (' + counts[k] + ')').join(', '));\n`;
  writeFileSync(join(proj, 'esm.mjs'), esm);
  writeFileSync(join(proj, 'cjs.cjs'), cjs);
  run('node', ['esm.mjs'], { cwd: proj });
  run('node', ['cjs.cjs'], { cwd: proj });

  // 4. bundle sizes against the budget
  const budget = JSON.parse(readFileSync('scripts/bundle-budget.json', 'utf8'));
  const rows = [];
  for (const n of names) {
    const result = await build({
      stdin: { contents: `export * from '${n}';`, resolveDir: proj, loader: 'js' },
      bundle: true,
      minify: true,
      format: 'esm',
      platform: n === 'meniscus/node' ? 'node' : 'browser',
      write: false,
      logLevel: 'silent',
    });
    const bytes = result.outputFiles[0].contents;
    const gz = gzipSync(bytes).length;
    const limit = budget[n];
    const ok = typeof limit === 'number' && gz <= limit;
    if (!ok) failed = true;
    rows.push({ subpath: n, minified: bytes.length, gzip: gz, budget: limit ?? 'none', ok });
  }
  console.table(rows);
  if (failed) console.error('bundle-size budget exceeded (or missing) for a subpath: see scripts/bundle-budget.json');
} finally {
  rmSync(work, { recursive: true, force: true });
}
process.exit(failed ? 1 : 0);
