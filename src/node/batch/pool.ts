/**
 * A pool of worker threads that runs a list of tasks, each task in whichever worker is
 * free next. A task that throws is reported as failed and the run goes on; a worker that
 * dies is replaced. Built directly on `node:worker_threads` (Node only).
 *
 * The worker script calls {@link serveTasks} with a setup function; the main thread
 * calls {@link runTasks}. Worker scripts may be `.js` files, or `.ts` files when the
 * library runs from source under tsx (they are then loaded through tsx's loader).
 *
 * @module
 */
import { createRequire } from 'node:module';
import { availableParallelism } from 'node:os';
import { pathToFileURL } from 'node:url';
import { isMainThread, parentPort, Worker, workerData as sharedWorkerData } from 'node:worker_threads';
import { checkInteger, typeError } from '../../core/index.js';

/** What happened to one task. */
export type TaskOutcome<R> =
  | { readonly index: number; readonly ok: true; readonly value: R }
  | { readonly index: number; readonly ok: false; readonly error: string };

/** Options of {@link runTasks}. */
export interface RunTasksOptions<R> {
  /** The worker script (a file URL or path): it must call {@link serveTasks}. */
  worker: URL | string;
  /** Number of worker threads. @defaultValue `os.availableParallelism()` (one per core), at most the number of tasks */
  threads?: number;
  /** Data handed to every worker's setup function (structured-cloneable). @defaultValue undefined */
  workerData?: unknown;
  /** Called as each task finishes, in completion order. */
  onOutcome?: (outcome: TaskOutcome<R>) => void;
  /** How many times a worker that died (not a task that threw) is replaced before the run gives up. @defaultValue 8 */
  maxRestarts?: number;
}

type ToWorker = { type: 'task'; id: number; task: unknown } | { type: 'close' };
type FromWorker =
  | { type: 'ready' }
  | { type: 'fatal'; error: string }
  | { type: 'done'; id: number; ok: true; value: unknown }
  | { type: 'done'; id: number; ok: false; error: string };

function errorText(e: unknown): string {
  if (e instanceof Error) return e.message || e.name;
  return String(e);
}

/**
 * Start a worker thread on a script, loading a `.ts` script through tsx's loader (for
 * running from source); a `.js`/`.mjs`/`.cjs` script starts directly.
 *
 * @param script - The script's file URL or path.
 * @param workerData - Data for the worker (`workerData` of `node:worker_threads`).
 * @returns The worker.
 * @throws {@link core!MeniscusTypeError} for a script that is neither a URL nor a path.
 * @example
 * ```ts
 * const w = startWorker(new URL('./my-worker.js', import.meta.url), { scale: 2 });
 * ```
 */
export function startWorker(script: URL | string, workerData?: unknown): Worker {
  if (!(script instanceof URL) && (typeof script !== 'string' || script.length === 0)) {
    typeError('startWorker', 'script', script, 'a file URL or a path');
  }
  const url = script instanceof URL ? script : /^file:/.test(script) ? new URL(script) : pathToFileURL(script);
  if (!/\.[cm]?ts$/.test(url.pathname)) return new Worker(url, { workerData });
  // From source: Node does not pass the parent's loader to workers, so the worker
  // starts on a tiny bootstrap that imports the script through tsx's API.
  const req = createRequire(url);
  const api = new URL('./dist/esm/api/index.mjs', pathToFileURL(req.resolve('tsx/package.json'))).href;
  const code = `import(${JSON.stringify(api)}).then((m) => m.tsImport(${JSON.stringify(url.href)}, ${JSON.stringify(url.href)}))` +
    `.catch((e) => { require('node:worker_threads').parentPort.postMessage({ type: 'fatal', error: String(e && e.stack || e) }); });`;
  return new Worker(code, { eval: true, workerData });
}

/**
 * Run tasks in a pool of worker threads. Each worker receives `workerData`, runs its
 * setup once, then takes tasks one at a time; results are returned in task order
 * whatever order they finished in. A task that throws gives an outcome with `ok: false`
 * and its message; the other tasks still run. A worker that dies mid-task fails that
 * task and is replaced (up to `maxRestarts` times).
 *
 * @param tasks - The tasks (structured-cloneable).
 * @param options - See {@link RunTasksOptions}.
 * @returns One outcome per task, in task order.
 * @throws {@link core!MeniscusRangeError} for a bad thread count; an `Error` when a worker's
 *   setup fails (every worker would fail alike) or workers keep dying.
 * @example
 * ```ts
 * const outcomes = await runTasks([1, 2, 3], { worker: new URL('./square-worker.js', import.meta.url), threads: 2 });
 * outcomes.filter((o) => !o.ok).length; // failed tasks
 * ```
 */
export async function runTasks<T, R>(tasks: readonly T[], options: RunTasksOptions<R>): Promise<TaskOutcome<R>[]> {
  const fn = 'runTasks';
  if (!Array.isArray(tasks)) typeError(fn, 'tasks', tasks, 'an array of tasks');
  const want = options.threads === undefined ? availableParallelism() : checkInteger(fn, 'options.threads', options.threads, 1, 1024);
  const maxRestarts = options.maxRestarts === undefined ? 8 : checkInteger(fn, 'options.maxRestarts', options.maxRestarts, 0, 1000);
  const outcomes: (TaskOutcome<R> | undefined)[] = new Array(tasks.length);
  if (tasks.length === 0) return [];
  const threads = Math.min(want, tasks.length);
  let next = 0;
  let finished = 0;
  let restarts = 0;
  const live = new Set<Worker>();
  return await new Promise<TaskOutcome<R>[]>((resolveAll, rejectAll) => {
    let failed = false;
    const fail = (e: Error): void => {
      if (failed) return;
      failed = true;
      for (const w of live) void w.terminate();
      rejectAll(e);
    };
    const record = (o: TaskOutcome<R>): void => {
      outcomes[o.index] = o;
      finished++;
      try {
        options.onOutcome?.(o);
      } catch (e) {
        fail(e instanceof Error ? e : new Error(String(e)));
        return;
      }
      if (finished === tasks.length && !failed) {
        for (const w of live) w.postMessage({ type: 'close' } satisfies ToWorker);
        resolveAll(outcomes as TaskOutcome<R>[]);
      }
    };
    const spawn = (): void => {
      const w = startWorker(options.worker, options.workerData);
      live.add(w);
      let current = -1;
      let ready = false;
      const feed = (): void => {
        if (failed) return;
        if (next < tasks.length) {
          current = next++;
          w.postMessage({ type: 'task', id: current, task: tasks[current] } satisfies ToWorker);
        } else {
          current = -1;
          w.postMessage({ type: 'close' } satisfies ToWorker);
        }
      };
      w.on('message', (m: FromWorker) => {
        if (m.type === 'ready') {
          ready = true;
          feed();
        } else if (m.type === 'fatal') {
          fail(new Error(`a worker could not start: ${m.error}`));
        } else if (m.type === 'done') {
          const id = m.id;
          current = -1;
          record(m.ok ? { index: id, ok: true, value: m.value as R } : { index: id, ok: false, error: m.error });
          feed();
        }
      });
      w.on('error', (e) => {
        if (!ready) fail(new Error(`a worker could not start: ${errorText(e)}`));
        else if (current >= 0) {
          const id = current;
          current = -1;
          record({ index: id, ok: false, error: `the worker died: ${errorText(e)}` });
        }
      });
      w.on('exit', (code) => {
        live.delete(w);
        if (failed || finished === tasks.length) return;
        if (current >= 0) {
          const id = current;
          current = -1;
          record({ index: id, ok: false, error: `the worker exited with code ${code}` });
        }
        if (next < tasks.length && live.size < threads) {
          if (restarts++ >= maxRestarts) fail(new Error(`workers died ${restarts} times; giving up`));
          else spawn();
        } else if (live.size === 0 && finished < tasks.length) {
          fail(new Error('every worker exited before the tasks were done'));
        }
      });
    };
    for (let k = 0; k < threads; k++) spawn();
  });
}

/**
 * The worker side of {@link runTasks}: call it once at the top level of a worker script.
 * `setup` receives the pool's `workerData` and returns the function that runs one task
 * (it may be async). Does nothing on the main thread.
 *
 * @param setup - Builds the task function from the shared data (runs once per worker).
 * @example
 * ```ts
 * // square-worker.ts
 * import { serveTasks } from 'meniscus/node';
 * serveTasks(() => (x: number) => x * x);
 * ```
 */
export function serveTasks<T, R>(setup: (workerData: unknown) => ((task: T) => R | Promise<R>) | Promise<(task: T) => R | Promise<R>>): void {
  if (isMainThread || parentPort === null) return;
  const port = parentPort;
  void (async () => {
    let run: (task: T) => R | Promise<R>;
    try {
      run = await setup(sharedWorkerData);
    } catch (e) {
      port.postMessage({ type: 'fatal', error: errorText(e) } satisfies FromWorker);
      return;
    }
    port.on('message', (m: ToWorker) => {
      if (m.type === 'close') {
        port.close();
        return;
      }
      void (async () => {
        try {
          const value = await run(m.task as T);
          port.postMessage({ type: 'done', id: m.id, ok: true, value } satisfies FromWorker);
        } catch (e) {
          port.postMessage({ type: 'done', id: m.id, ok: false, error: errorText(e) } satisfies FromWorker);
        }
      })();
    });
    port.postMessage({ type: 'ready' } satisfies FromWorker);
  })();
}
