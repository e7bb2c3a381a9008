/**
 * `meniscus process`: a sequence of sensor frames (and scene images) with a run
 * configuration into surfaces, corrected images and a report, in parallel and resumable.
 *
 * @module
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join, relative, resolve } from 'node:path';
import type { TaskOutcome } from '../batch/pool.js';
import { readFrameResult } from '../frame-result.js';
import { writePng } from '../png.js';
import { loadRunConfig } from '../schemas/build.js';
import { createGrid } from '../../core/index.js';
import type { Grid, Mask } from '../../core/index.js';
import { heightMapImage, slopeFieldSvg, slopeHistogramSvg } from '../../viz/index.js';
import { intOption, parseCommandArgs, type OptionSpec } from './args.js';
import { EXIT_CODES, UsageError } from './exit-codes.js';
import { frameOutputDir, frameState, prepareFrameJob, removePartials } from './frame-job.js';
import type { FrameJobSetup, FrameSummary, FrameTask } from './frame-job.js';
import { listSequence } from './frames.js';
import { formatCommandHelp } from './help.js';
import type { CommandHelp } from './help.js';
import type { CliIO } from './io.js';
import { runFrames } from './jobs.js';

const OPTIONS: Record<string, OptionSpec> = {
  frames: { type: 'string', short: 'f', value: 'DIR|PATTERN', help: 'The sensor frames: a folder of .png/.npy images, or a numbered pattern such as "cam/frame_%04d.png". Required.' },
  scenes: { type: 'string', short: 's', value: 'DIR|PATTERN', help: 'Scene images seen through the surface, paired with the frames in order.' },
  truth: { type: 'string', value: 'DIR', help: 'The truth folder of a simulation (e.g. sim/truth): score each frame against it in the report.' },
  out: { type: 'string', short: 'o', value: 'DIR', help: 'Output folder (created if needed). Required.' },
  workers: { type: 'string', short: 'w', value: 'N', help: 'Worker threads; 1 runs in this thread. Default: one per core.' },
  limit: { type: 'string', value: 'N', help: 'Process at most the first N frames of the sequence.' },
  redo: { type: 'boolean', help: 'Process every frame again, even those already done.' },
  quiet: { type: 'boolean', short: 'q', help: 'No progress bar and no summary line.' },
  help: { type: 'boolean', short: 'h', help: 'Show this help.' },
};

/** The help of `process`. */
export const PROCESS_HELP: CommandHelp = {
  name: 'process',
  summary: 'turn a sequence of sensor frames into surfaces, corrected images and a report',
  usage: ['process RUN.json --frames DIR|PATTERN --out DIR [--scenes DIR|PATTERN] [--truth DIR] [--workers N] [--redo]'],
  description: [
    'Reads the run configuration (sensor, camera, light and the options of each stage; "meniscus schema run" prints its schema), ' +
      'then processes every frame: spots are found and matched to apertures, turned into slopes and integrated into a height map. ' +
      'Each frame gets a folder OUT/frames/NAME/ with height.npy, mask.npy and meta.json (loadable with NumPy alone). ' +
      'With --scenes (and a "correct" section in the run file) each scene image is corrected through the measured surface into corrected.png (16-bit, in the codes of the scene image) and corrected_mask.png. OUT/report.json and OUT/report.md list every frame, its counts and any failure; OUT/report-height.png, report-slopes.svg and report-histogram.svg show the last frame.',
    'Frames are shared among worker threads (one per core by default); the results are the same as with --workers 1. ' +
      'A frame that fails is reported and the run goes on; the exit code is then 1. ' +
      'Running again skips the frames already done with the same configuration (and the same use of --scenes and --truth), so an interrupted run resumes where it stopped; --redo processes them all again. ' +
      'A progress bar with frames per second and time left is drawn on a terminal only.',
  ],
  options: OPTIONS,
  examples: [
    ['every frame of a folder, one worker per core', 'process run.json --frames tank/frames --out tank/results'],
    ['a numbered sequence with scene images, two workers', 'process run.json -f "cam/frame_%04d.png" -s "scene/img_%04d.png" -o out -w 2'],
    ['do it all again after changing the detector settings', 'process run.json -f tank/frames -o tank/results --redo'],
    ['a simulation, scored against its truth', 'process sim/run.json -f sim/frames -s sim/scenes --truth sim/truth -o sim/results'],
  ],
};

/** The run report written to `report.json`. */
export interface RunReport {
  /** Always `"meniscus-run-report"`. */
  readonly format: 'meniscus-run-report';
  /** Layout version. */
  readonly version: 1;
  /** Fingerprint of the configuration. */
  readonly configHash: string;
  /** Worker threads used (1 = in the main thread). */
  readonly workers: number;
  /** Counts. */
  readonly summary: { readonly frames: number; readonly processed: number; readonly skipped: number; readonly failed: number; readonly seconds: number; readonly framesPerSecond: number };
  /** One entry per frame, in sequence order. */
  readonly frames: readonly (
    | { readonly frame: string; readonly status: 'ok'; readonly result: FrameSummary }
    | { readonly frame: string; readonly status: 'skipped' }
    | { readonly frame: string; readonly status: 'failed'; readonly error: string }
  )[];
}

/** Slopes of a height grid by central differences where a node and its four neighbours are valid. */
function gridSlopes(h: Grid, mask: Mask): { p: Grid; q: Grid; mask: Mask } {
  const { width: w, height: hh, dx, dy } = h;
  const spec = { width: w, height: hh, dx, dy, x0: h.x0, y0: h.y0 };
  const p = createGrid(spec), q = createGrid(spec);
  const m = new Uint8Array(w * hh);
  for (let j = 1; j < hh - 1; j++) {
    for (let i = 1; i < w - 1; i++) {
      const k = j * w + i;
      if (!(mask[k] && mask[k - 1] && mask[k + 1] && mask[k - w] && mask[k + w])) continue;
      p.data[k] = (h.data[k + 1]! - h.data[k - 1]!) / (2 * dx);
      q.data[k] = (h.data[k + w]! - h.data[k - w]!) / (2 * dy);
      m[k] = 1;
    }
  }
  return { p, q, mask: m };
}

function markdownReport(r: RunReport): string {
  const s = r.summary;
  const lines = [
    '# Run report',
    '',
    `${s.frames} frames: ${s.processed - s.failed} processed, ${s.skipped} already done, ${s.failed} failed; ` +
      `${s.seconds.toFixed(1)} s with ${r.workers} worker${r.workers === 1 ? '' : 's'} (${s.framesPerSecond.toFixed(2)} frames/s).`,
    '',
    '| frame | status | spots found | matched | missing apertures | RMS height (mm) | corrected pixels | height error (mm) | SSIM distorted → corrected | note |',
    '| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- |',
  ];
  for (const f of r.frames) {
    if (f.status === 'ok') {
      const x = f.result;
      lines.push(
        `| ${f.frame} | ok | ${x.spotsFound} | ${x.spotsMatched} | ${x.aperturesMissing} | ${(x.heightRms * 1e3).toFixed(3)} | ${x.correctedPixels ?? ''} | ` +
          `${x.scores ? `${(x.scores.heightRms * 1e3).toFixed(3)} (flat: ${(x.scores.truthRms * 1e3).toFixed(3)})` : ''} | ` +
          `${x.scores && x.scores.ssimCorrected !== null ? `${x.scores.ssimDistorted!.toFixed(3)} → ${x.scores.ssimCorrected.toFixed(3)}` : ''} | ${x.warnings.join('; ').replace(/\|/g, '/')} |`,
      );
    } else if (f.status === 'skipped') lines.push(`| ${f.frame} | already done | | | | | | | | |`);
    else lines.push(`| ${f.frame} | **failed** | | | | | | | | ${f.error.replace(/\|/g, '/').replace(/\n/g, ' ')} |`);
  }
  if (s.processed - s.failed > 0) {
    lines.push(
      '',
      '## The last frame',
      '',
      '![height map of the last frame](report-height.png)',
      '',
      'Slopes from the height map (central differences), as vectors and as a histogram against a Gaussian of the same mean-square slope:',
      '',
      '![slope field](report-slopes.svg)',
      '',
      '![slope histogram](report-histogram.svg)',
    );
  }
  return lines.join('\n') + '\n';
}

/**
 * Run `process`.
 *
 * @param argv - Arguments after the subcommand.
 * @param io - Streams and folder.
 * @returns The exit code: 0, or 1 when some frames failed.
 * @throws {@link UsageError}, `ConfigValidationError` or file-system errors (mapped to
 *   exit codes by the caller).
 * @example
 * ```ts
 * await runProcess(['run.json', '--frames', 'frames', '--out', 'out', '--workers', '2'], { stdout: process.stdout, stderr: process.stderr });
 * ```
 */
export async function runProcess(argv: readonly string[], io: CliIO): Promise<number> {
  const { values, positionals } = parseCommandArgs('process', argv, OPTIONS);
  if (values.help) {
    io.stdout.write(formatCommandHelp(PROCESS_HELP));
    return EXIT_CODES.ok;
  }
  if (positionals.length !== 1) throw new UsageError(`expected one run configuration file; got ${positionals.length}`, 'process');
  if (typeof values.frames !== 'string') throw new UsageError('--frames is required', 'process');
  if (typeof values.out !== 'string') throw new UsageError('--out is required', 'process');
  const workers = intOption('process', 'workers', values.workers, 1, 1024) ?? availableParallelism();
  const limit = intOption('process', 'limit', values.limit, 1, Number.MAX_SAFE_INTEGER);
  const cwd = io.cwd ?? process.cwd();
  const outDir = resolve(cwd, values.out);

  const loaded = loadRunConfig(resolve(cwd, positionals[0]!));
  // The fingerprint covers what changes a frame's outputs: the configuration, and whether
  // scene images and truth were given.
  const fingerprint = { run: loaded.run, scenes: typeof values.scenes === 'string', truth: typeof values.truth === 'string' };
  const configHash = createHash('sha256').update(JSON.stringify(fingerprint)).digest('hex').slice(0, 16);
  const setup: FrameJobSetup = { run: loaded.run, outDir, configHash };
  // Build everything once here, so that a configuration the library refuses stops the
  // run before any worker starts.
  const job = prepareFrameJob(setup);

  let frames = listSequence(values.frames, cwd, 'frames');
  if (limit !== undefined) frames = frames.slice(0, limit);
  let scenes: string[] | undefined;
  if (typeof values.scenes === 'string') {
    if (loaded.run.correct === undefined) throw new UsageError('--scenes needs a "correct" section in the run configuration (the scene camera and target)', 'process');
    const s = listSequence(values.scenes, cwd, 'scenes');
    if (s.length < frames.length) throw new UsageError(`--scenes has ${s.length} images but there are ${frames.length} frames`, 'process');
    scenes = s.slice(0, frames.length).map((x) => x.path);
  }
  const truthDir = typeof values.truth === 'string' ? resolve(cwd, values.truth) : undefined;
  if (truthDir !== undefined) {
    for (const f of frames) if (!existsSync(join(truthDir, f.stem, 'meta.json'))) throw new UsageError(`--truth ${values.truth} has no folder for frame ${f.stem}`, 'process');
  }
  const tasks: FrameTask[] = [];
  const status = new Map<string, 'skipped'>();
  for (let k = 0; k < frames.length; k++) {
    const f = frames[k]!;
    const task: FrameTask = {
      stem: f.stem,
      frame: f.path,
      ...(scenes ? { scene: scenes[k]! } : {}),
      ...(truthDir !== undefined ? { truth: join(truthDir, f.stem) } : {}),
    };
    const state = values.redo ? 'todo' : frameState(outDir, f.stem, configHash);
    if (state === 'other') {
      throw new UsageError(
        `${relative(cwd, frameOutputDir(outDir, f.stem)) || '.'} was written with another configuration; use --redo to replace it, or another --out`,
        'process',
      );
    }
    if (state === 'done') status.set(f.stem, 'skipped');
    else tasks.push(task);
  }
  mkdirSync(join(outDir, 'frames'), { recursive: true });
  removePartials(join(outDir, 'frames'));

  const quiet = values.quiet === true;
  const { outcomes, seconds, used } = await runFrames({ tasks, workers, workerData: { job: 'process', setup }, job, io, quiet });
  const results = new Map<string, TaskOutcome<FrameSummary>>();
  outcomes.forEach((o, k) => results.set(tasks[k]!.stem, o));

  let failed = 0;
  let lastOk: string | undefined;
  const entries: RunReport['frames'][number][] = frames.map((f) => {
    if (status.get(f.stem) === 'skipped') return { frame: f.stem, status: 'skipped' as const };
    const o = results.get(f.stem)!;
    if (o.ok) {
      lastOk = f.stem;
      return { frame: f.stem, status: 'ok' as const, result: o.value };
    }
    failed++;
    return { frame: f.stem, status: 'failed' as const, error: o.error };
  });
  const report: RunReport = {
    format: 'meniscus-run-report',
    version: 1,
    configHash,
    workers: used,
    summary: { frames: frames.length, processed: tasks.length, skipped: status.size, failed, seconds, framesPerSecond: seconds > 0 ? tasks.length / seconds : 0 },
    frames: entries,
  };
  writeFileSync(join(outDir, 'report.json'), JSON.stringify(report, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n');
  writeFileSync(join(outDir, 'report.md'), markdownReport(report));
  if (lastOk !== undefined) {
    const last = readFrameResult(frameOutputDir(outDir, lastOk));
    const mask = last.mask ?? new Uint8Array(last.height.data.length).fill(1);
    writePng(join(outDir, 'report-height.png'), heightMapImage(last.height, { mask }).image, { transfer: 'srgb' });
    const { p, q, mask: sm } = gridSlopes(last.height, mask);
    let valid = 0;
    for (let k = 0; k < sm.length; k++) valid += sm[k]!;
    if (valid > 0) {
      writeFileSync(join(outDir, 'report-slopes.svg'), slopeFieldSvg(p, q, { mask: sm, title: `slopes, ${lastOk}` }));
      writeFileSync(join(outDir, 'report-histogram.svg'), slopeHistogramSvg(p, q, { mask: sm, title: `slope histogram, ${lastOk}` }));
    }
  }
  for (const e of entries) if (e.status === 'failed') io.stderr.write(`frame ${e.frame} failed: ${e.error}\n`);
  if (!quiet) {
    io.stdout.write(
      `${tasks.length - failed} of ${frames.length} frames processed, ${status.size} already done, ${failed} failed; ` +
        `${seconds.toFixed(2)} s, ${report.summary.framesPerSecond.toFixed(2)} frames/s with ${used} worker${used === 1 ? '' : 's'}\n`,
    );
  }
  return failed > 0 ? EXIT_CODES.framesFailed : EXIT_CODES.ok;
}
