// Runs the benchmarks on JavaScript compiled the way the published build compiles it.
//
// The sources under src/, bench/ and the test helpers the bench cases use are transpiled
// file by file with esbuild (the compiler tsup uses for dist/) into
// node_modules/.cache/meniscus-bench/, and bench/run.js is then run there with plain
// node, forwarding the arguments:
//
//   node scripts/bench.mjs [--json] [--quick] [--repeat N] [case-prefix …]
//
// Why not tsx: its on-the-fly loader was measured to run some kernels more slowly than
// the same code compiled ahead of time (the 1024² DCT Poisson solve: 49 ms minimum under
// tsx against 38 ms from dist/ or from this script, in one sitting), so the bench would
// have timed the loader, not the code users install.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const outdir = join(root, 'node_modules', '.cache', 'meniscus-bench');

/** Every .ts file under `dir`, skipping test files (the bench never loads them). */
function sources(dir) {
  const found = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) found.push(...sources(path));
    else if (name.endsWith('.ts') && !name.endsWith('.test.ts') && !name.endsWith('.d.ts')) found.push(path);
  }
  return found;
}

const entryPoints = ['src', 'bench', 'test'].flatMap((d) => sources(join(root, d)));
rmSync(outdir, { recursive: true, force: true });
mkdirSync(outdir, { recursive: true });
await build({
  entryPoints,
  outdir,
  outbase: root,
  bundle: false,
  format: 'esm',
  platform: 'node',
  target: 'node20',
  sourcemap: 'inline',
  logLevel: 'warning',
});
writeFileSync(join(outdir, 'package.json'), '{ "type": "module" }\n');

const runner = join(outdir, 'bench', 'run.js');
const r = spawnSync(process.execPath, ['--enable-source-maps', relative(process.cwd(), runner), ...process.argv.slice(2)], { stdio: 'inherit' });
process.exit(r.status ?? 1);
