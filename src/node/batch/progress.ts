/**
 * A one-line progress bar for long runs: done / total, frames per second, time left and
 * failures, redrawn in place at most a few times a second. It draws only on a terminal,
 * so logs and pipes stay clean (Node only).
 *
 * @module
 */
import { checkInteger, checkOptions } from '../../core/index.js';

/** Where the bar is drawn: a writable text stream (`process.stderr` by default). */
export interface ProgressStream {
  /** Write text. */
  write(text: string): unknown;
  /** True on a terminal; the bar is quiet otherwise. */
  readonly isTTY?: boolean;
  /** Terminal width, characters. */
  readonly columns?: number;
}

/** Options of {@link createProgress}. */
export interface ProgressOptions {
  /** Where to draw. @defaultValue `process.stderr` */
  stream?: ProgressStream;
  /** Word before the counts. @defaultValue "frames" */
  unit?: string;
  /** Draw even when the stream is not a terminal (for tests). @defaultValue false */
  force?: boolean;
  /** Least time between redraws, milliseconds. @defaultValue 100 */
  intervalMs?: number;
  /** The clock, milliseconds. @defaultValue `performance.now` */
  now?: () => number;
}

/** A progress bar made by {@link createProgress}. */
export interface Progress {
  /** Record finished items (`failed` of them failed) and redraw if due. */
  tick(count?: number, failed?: number): void;
  /** Redraw now and end the line. */
  finish(): void;
  /** Items done so far (failed included). */
  readonly done: number;
  /** Items failed so far. */
  readonly failed: number;
  /** Whether the bar draws at all. */
  readonly active: boolean;
  /** The current line (without the carriage return). */
  line(): string;
}

/**
 * Format seconds as `m:ss` or `h:mm:ss`.
 *
 * @param seconds - Non-negative seconds (non-finite gives `"--:--"`).
 * @returns The text.
 * @example
 * ```ts
 * formatDuration(75); // "1:15"
 * ```
 */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '--:--';
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600), m = Math.floor((s % 3600) / 60), r = s % 60;
  const two = (v: number): string => String(v).padStart(2, '0');
  return h > 0 ? `${h}:${two(m)}:${two(r)}` : `${m}:${two(r)}`;
}

/**
 * Make a progress bar for `total` items; the rate counts items done since the bar was
 * made, and the time left assumes that rate holds.
 *
 * @param total - Number of items.
 * @param options - See {@link ProgressOptions}.
 * @returns The bar.
 * @throws {@link core!MeniscusRangeError} for a negative or non-integer total.
 * @example
 * ```ts
 * const bar = createProgress(100);
 * for (let k = 0; k < 100; k++) { work(k); bar.tick(); }
 * bar.finish();
 * ```
 */
export function createProgress(total: number, options?: ProgressOptions): Progress {
  const fn = 'createProgress';
  checkInteger(fn, 'total', total, 0);
  const o = checkOptions(fn, options);
  const stream: ProgressStream = o.stream ?? process.stderr;
  const unit = o.unit ?? 'frames';
  const active = o.force === true || stream.isTTY === true;
  const interval = o.intervalMs ?? 100;
  const now = o.now ?? (() => performance.now());
  const t0 = now();
  let done = 0, failed = 0, last = -Infinity;
  const line = (): string => {
    const t = (now() - t0) / 1000;
    const rate = t > 0 ? done / t : 0;
    const left = rate > 0 ? (total - done) / rate : NaN;
    const width = Math.max(10, Math.min(30, (stream.columns ?? 80) - 60));
    const filled = total > 0 ? Math.round((width * done) / total) : width;
    const bar = '#'.repeat(filled) + '.'.repeat(width - filled);
    const pct = total > 0 ? Math.floor((100 * done) / total) : 100;
    return `[${bar}] ${String(pct).padStart(3)} % ${done}/${total} ${unit}  ${rate.toFixed(rate < 10 ? 2 : 1)}/s  left ${formatDuration(left)}${failed > 0 ? `  ${failed} failed` : ''}`;
  };
  const draw = (): void => {
    if (!active) return;
    stream.write(`\r${line()}\u001b[K`);
  };
  return {
    tick(count = 1, nFailed = 0) {
      done += count;
      failed += nFailed;
      const t = now();
      if (t - last >= interval || done >= total) {
        last = t;
        draw();
      }
    },
    finish() {
      draw();
      if (active) stream.write('\n');
    },
    get done() {
      return done;
    },
    get failed() {
      return failed;
    },
    active,
    line,
  };
}
