// Loads OpenCV for JavaScript (npm opencv-bindings@4.5.5, a general-purpose reference
// library used only in tests) once per test file.
import { createRequire } from 'node:module';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type Cv = any;

let loading: Promise<{ cv: Cv }> | undefined;

/**
 * The loaded module, in a box: the emscripten module object is itself "thenable", so
 * a promise (or an async function) must never resolve with the bare module — it would
 * chain on the module's own `then` forever. Use `cv = (await loadCv()).cv`.
 */
export function loadCv(): Promise<{ cv: Cv }> {
  loading ??= new Promise((resolve) => {
    const require = createRequire(import.meta.url);
    const cv = require('opencv-bindings') as Cv;
    if (cv.Mat) resolve({ cv });
    else cv.onRuntimeInitialized = () => resolve({ cv });
  });
  return loading;
}

/** Read a CV_64F Mat's data and free the Mat. */
export function take(m: Cv): number[] {
  const a = Array.from(m.data64F as Float64Array);
  m.delete();
  return a;
}
