#!/usr/bin/env node
// Writes package.json "exports" from the areas found as src/<area>/index.ts, so that the
// subpath map, the tsup entries and the typedoc entry points always agree.
// Usage: node scripts/sync-exports.mjs [--check]   (--check: exit 1 if out of date)
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';

const areas = readdirSync('src', { withFileTypes: true })
  .filter((d) => d.isDirectory() && existsSync(`src/${d.name}/index.ts`))
  .map((d) => d.name)
  .sort((a, b) => (a === 'core' ? -1 : b === 'core' ? 1 : a === 'node' ? 1 : b === 'node' ? -1 : a.localeCompare(b)));

const entry = (base) => ({
  import: { types: `./dist/${base}.d.ts`, default: `./dist/${base}.js` },
  require: { types: `./dist/${base}.d.cts`, default: `./dist/${base}.cjs` },
});
const exportsMap = { '.': entry('index') };
for (const a of areas) exportsMap[`./${a}`] = entry(`${a}/index`);
exportsMap['./package.json'] = './package.json';

const pkg = JSON.parse(readFileSync('package.json', 'utf8'));
const same = JSON.stringify(pkg.exports) === JSON.stringify(exportsMap);
if (process.argv.includes('--check')) {
  if (!same) {
    console.error('package.json "exports" is out of date: run node scripts/sync-exports.mjs');
    process.exit(1);
  }
} else if (!same) {
  pkg.exports = exportsMap;
  writeFileSync('package.json', JSON.stringify(pkg, null, 2) + '\n');
  console.log(`exports: . ${areas.map((a) => './' + a).join(' ')}`);
}
