import { readdirSync, existsSync } from 'node:fs';
import { defineConfig } from 'tsup';

// One entry per area: src/<area>/index.ts becomes dist/<area>/index.{js,cjs,d.ts},
// matching the subpaths of package.json "exports". src/index.ts is the root entry.
const areas = readdirSync('src', { withFileTypes: true })
  .filter((d) => d.isDirectory() && existsSync(`src/${d.name}/index.ts`))
  .map((d) => d.name);

const entry: Record<string, string> = { index: 'src/index.ts' };
for (const a of areas) entry[`${a}/index`] = `src/${a}/index.ts`;
// The command line and its worker script (found beside the bundled file at run time).
entry['node/cli/main'] = 'src/node/cli/main.ts';
entry['node/cli/worker'] = 'src/node/cli/worker.ts';

export default defineConfig({
  entry,
  format: ['esm', 'cjs'],
  dts: true,
  sourcemap: true,
  clean: true,
  splitting: true,
  treeshake: true,
  target: 'es2022',
  platform: 'neutral',
  external: [/^node:/, 'pngjs', 'ajv'],
});
