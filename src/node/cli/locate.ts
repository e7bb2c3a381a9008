/**
 * Where the command line's worker script lies, from source (`.ts` under tsx or vitest) and in
 * the built package (`.js` / `.cjs`, possibly inside a shared chunk).
 *
 * @module
 */
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';

declare const __filename: string | undefined;

function moduleUrl(): string {
  // import.meta.url in ESM (source and build); __filename in the CommonJS build.
  const meta = typeof import.meta === 'object' && import.meta !== null ? (import.meta as { url?: string }).url : undefined;
  if (typeof meta === 'string' && meta.length > 0) return meta;
  if (typeof __filename === 'string') return pathToFileURL(__filename).href;
  throw new Error('cannot tell where the meniscus command line is installed');
}

/**
 * The URL of the command line's worker script. From source this is `worker.ts` beside
 * this file; in the build it is `node/cli/worker.js` (`.cjs` for the CommonJS build),
 * found relative to whichever bundled file this code ended up in.
 *
 * @returns The worker script's file URL.
 * @throws `Error` when no worker script is found (an incomplete installation).
 * @example
 * ```ts
 * runTasks(tasks, { worker: cliWorkerUrl(), threads: 2, workerData });
 * ```
 */
export function cliWorkerUrl(): URL {
  const here = moduleUrl();
  if (/\.[cm]?ts$/.test(new URL(here).pathname)) return new URL('./worker.ts', here);
  const ext = /\.cjs$/.test(here) ? '.cjs' : '.js';
  const candidates = [`./worker${ext}`, `./cli/worker${ext}`, `./node/cli/worker${ext}`, `../cli/worker${ext}`, `../node/cli/worker${ext}`];
  for (const c of candidates) {
    const u = new URL(c, here);
    if (existsSync(fileURLToPath(u))) return u;
  }
  throw new Error(`the worker script was not found near ${here} (looked for ${candidates.join(', ')})`);
}
