import { describe, expect, it } from 'vitest';
import { runTasks } from '../../src/node/batch/pool.js';
import type { TaskOutcome } from '../../src/node/batch/pool.js';
import { createProgress, formatDuration } from '../../src/node/batch/progress.js';

const SQUARE = new URL('./fixtures/square-worker.ts', import.meta.url);

describe('runTasks (worker pool on node:worker_threads)', () => {
  it('returns results in task order whatever order they finish in, with shared worker data', async () => {
    const tasks = Array.from({ length: 20 }, (_, k) => k);
    const seen: number[] = [];
    const out = await runTasks<number, number>(tasks, { worker: SQUARE, threads: 2, workerData: { offset: 1 }, onOutcome: (o) => seen.push(o.index) });
    expect(out.map((o) => (o.ok ? o.value : NaN))).toEqual(tasks.map((x) => x * x + 1));
    expect(out.map((o) => o.index)).toEqual(tasks);
    expect([...seen].sort((a, b) => a - b)).toEqual(tasks);
  });

  it('reports a task that throws and goes on with the others', async () => {
    const out = await runTasks<number, number>([1, -2, 3], { worker: SQUARE, threads: 2 });
    expect(out[0]).toEqual({ index: 0, ok: true, value: 1 });
    expect(out[1]!.ok).toBe(false);
    expect((out[1] as Extract<TaskOutcome<number>, { ok: false }>).error).toMatch(/negative input -2/);
    expect(out[2]).toEqual({ index: 2, ok: true, value: 9 });
  });

  it('fails the task of a worker that dies, replaces the worker and finishes the rest', async () => {
    const out = await runTasks<number, number>([2, 999, 4, 5], { worker: SQUARE, threads: 1 });
    expect(out.map((o) => o.ok)).toEqual([true, false, true, true]);
    expect((out[1] as { error: string }).error).toMatch(/exited with code 7/);
    expect(out[3]).toEqual({ index: 3, ok: true, value: 25 });
  });

  it('gives up with the setup error when workers cannot start', async () => {
    await expect(runTasks([1, 2], { worker: new URL('./fixtures/broken-setup-worker.ts', import.meta.url), threads: 2 })).rejects.toThrow(/cannot open the calibration/);
  });

  it('handles an empty task list without starting workers', async () => {
    expect(await runTasks([], { worker: SQUARE })).toEqual([]);
  });
});

describe('createProgress', () => {
  const sink = (isTTY: boolean) => {
    const chunks: string[] = [];
    return { chunks, stream: { isTTY, columns: 100, write: (t: string) => chunks.push(t) } };
  };

  it('draws frames per second and time left on a terminal', () => {
    let t = 0;
    const { chunks, stream } = sink(true);
    const bar = createProgress(10, { stream, now: () => t, intervalMs: 0 });
    t = 2000; // 4 frames in 2 s: 2 frames/s, 6 left → 3 s
    bar.tick(4);
    expect(chunks.at(-1)).toMatch(/4\/10 frames {2}2\.00\/s {2}left 0:03/);
    t = 3000;
    bar.tick(1, 1);
    expect(bar.line()).toMatch(/1 failed/);
    bar.finish();
    expect(chunks.at(-1)).toBe('\n');
  });

  it('is quiet when the stream is not a terminal', () => {
    const { chunks, stream } = sink(false);
    const bar = createProgress(3, { stream });
    bar.tick();
    bar.finish();
    expect(bar.active).toBe(false);
    expect(chunks).toEqual([]);
  });

  it('formats durations as m:ss and h:mm:ss', () => {
    expect(formatDuration(75)).toBe('1:15');
    expect(formatDuration(3725)).toBe('1:02:05');
    expect(formatDuration(NaN)).toBe('--:--');
  });
});
