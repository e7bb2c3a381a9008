/** Worker-thread twin of the determinism test: run every seeded case and post the digests. */
import { parentPort, workerData } from 'node:worker_threads';
import { digest, seededCases } from './seeded.js';

const seed = (workerData as { seed: number }).seed;
const out: Record<string, string> = {};
for (const [name, run] of Object.entries(seededCases(seed))) out[name] = digest(run());
parentPort!.postMessage(out);
