/**
 * Benchmark runner.
 *
 *   npm run bench                       table of every case
 *   npm run bench -- --json             one JSON object a line: {case, size, median_ms, min_ms, error}
 *   npm run bench -- --quick            tiny sizes, one or two runs (a smoke test for CI)
 *   npm run bench -- optics.refract     only the named cases (prefix match)
 *   npm run bench -- --repeat 9         timed runs per case
 *
 * `npm run bench` compiles the tree first (scripts/bench.mjs) and runs this file as
 * JavaScript; `tsx bench/run.ts` runs it from source, which times some kernels slower.
 * Each case runs in a fresh child process (`--case NAME`, exact name).
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Bench } from 'tinybench';
import type { BenchCase } from './case.js';

interface Row {
  case: string;
  size: number;
  median_ms: number;
  min_ms: number;
  error: number;
  note?: string;
}

async function loadCases(): Promise<BenchCase[]> {
  const self = fileURLToPath(import.meta.url);
  const dir = join(dirname(self), 'cases');
  // .ts under tsx, .js where scripts/bench.mjs compiled the tree ahead of time
  const ext = self.endsWith('.js') ? '.js' : '.ts';
  const files = readdirSync(dir)
    .filter((f) => f.endsWith(ext))
    .sort();
  const all: BenchCase[] = [];
  for (const f of files) {
    const mod = (await import(pathToFileURL(join(dir, f)).href)) as { cases?: BenchCase[] };
    if (mod.cases) all.push(...mod.cases);
  }
  return all;
}

async function runCase(c: BenchCase, quick: boolean, repeat: number | undefined): Promise<Row> {
  const size = quick ? c.quickSize : c.size;
  const prepared = await c.prepare(size);
  let last: unknown;
  const iterations = repeat ?? (quick ? 2 : (c.iterations ?? 5));
  const bench = new Bench({ iterations, time: 0, warmup: true, warmupIterations: quick ? 1 : (c.warmup ?? 1), warmupTime: 0 });
  bench.add(c.name, () => {
    last = prepared.run();
  });
  await bench.run();
  const task = bench.tasks[0]!;
  const r = task.result;
  if (r.state !== 'completed') {
    const err = r.state === 'errored' ? r.error : new Error(`bench task ended in state ${r.state}`);
    throw err;
  }
  const median = r.latency.p50;
  const row: Row = {
    case: c.name,
    size,
    median_ms: Math.round(median * 1000) / 1000,
    min_ms: Math.round(r.latency.min * 1000) / 1000,
    error: prepared.error(last),
  };
  const note = prepared.notes?.(median);
  if (note) row.note = note;
  return row;
}

/** Prefix of the line a child prints its row on. */
const ROW = 'bench-row ';

/**
 * Run one case in a fresh node process (the same loader and flags as this one), so that
 * no case's heap or compiled code is shaped by the cases before it.
 */
function runIsolated(name: string, quick: boolean, repeat: number | undefined): Row {
  const argv = [...process.execArgv, fileURLToPath(import.meta.url), '--case', name];
  if (quick) argv.push('--quick');
  if (repeat !== undefined) argv.push('--repeat', String(repeat));
  const r = spawnSync(process.execPath, argv, { encoding: 'utf8', maxBuffer: 64 * 2 ** 20 });
  const line = r.stdout.split('\n').find((l) => l.startsWith(ROW));
  if (r.status !== 0 || line === undefined) {
    process.stderr.write(r.stdout + r.stderr);
    throw new Error(`bench case ${name} failed (exit ${r.status})`);
  }
  return JSON.parse(line.slice(ROW.length)) as Row;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const json = args.includes('--json');
  const quick = args.includes('--quick');
  let repeat: number | undefined;
  const ri = args.indexOf('--repeat');
  if (ri >= 0) repeat = Number(args[ri + 1]);
  const ci = args.indexOf('--case');
  const all = await loadCases();
  if (ci >= 0) {
    // child mode: one case by its exact name, its row (with the note) as one JSON line
    const c = all.find((x) => x.name === args[ci + 1]);
    if (!c) throw new Error(`no bench case is named ${args[ci + 1]}`);
    console.log(ROW + JSON.stringify(await runCase(c, quick, repeat)));
    return;
  }
  const names = args.filter((a, i) => !a.startsWith('--') && !(ri >= 0 && i === ri + 1));
  const cases = all.filter((c) => names.length === 0 || names.some((n) => c.name.startsWith(n)));
  if (cases.length === 0) throw new Error(`no bench case matches ${names.join(', ')}`);
  const rows: Row[] = [];
  for (const c of cases) {
    const row = runIsolated(c.name, quick, repeat);
    rows.push(row);
    if (json) {
      const { note: _note, ...rest } = row;
      console.log(JSON.stringify(rest));
    }
  }
  if (!json) {
    const head = ['case', 'size', 'median ms', 'min ms', 'error'];
    const body = rows.map((r) => [r.case, String(r.size), r.median_ms.toFixed(3), r.min_ms.toFixed(3), r.error.toExponential(3)]);
    const widths = head.map((h, k) => Math.max(h.length, ...body.map((b) => b[k]!.length)));
    const line = (cells: string[]) => cells.map((s, k) => (k === 0 ? s.padEnd(widths[k]!) : s.padStart(widths[k]!))).join('  ');
    console.log(line(head));
    console.log(widths.map((w) => '-'.repeat(w)).join('  '));
    for (const b of body) console.log(line(b));
    const notes = rows.filter((r) => r.note);
    if (notes.length) {
      console.log('');
      for (const r of notes) console.log(`${r.case}: ${r.note}`);
    }
  }
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
