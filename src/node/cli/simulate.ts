/**
 * `meniscus simulate`: a scenario into a folder of sensor frames, scene images and
 * truth, ready for `meniscus process`.
 *
 * @module
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join, relative, resolve } from 'node:path';
import { harbourScenario, tankScenario, validateScenario } from '../../pipeline/index.js';
import type { Scenario } from '../../pipeline/index.js';
import { readConfigFile, validateConfig } from '../schemas/validate.js';
import { intOption, parseCommandArgs, type OptionSpec } from './args.js';
import { EXIT_CODES, UsageError } from './exit-codes.js';
import { formatCommandHelp } from './help.js';
import type { CommandHelp } from './help.js';
import type { CliIO } from './io.js';
import { removePartials } from './frame-job.js';
import { runFrames } from './jobs.js';
import { prepareSimulateJob, SIMULATE_FOLDERS } from './simulate-job.js';
import type { SimulateJobSetup, SimulateSummary, SimulateTask } from './simulate-job.js';

const OPTIONS: Record<string, OptionSpec> = {
  out: { type: 'string', short: 'o', value: 'DIR', help: 'Output folder (created if needed). Required.' },
  preset: { type: 'string', value: 'NAME', help: 'Use a shipped scenario instead of a file: "tank" or "harbour".' },
  count: { type: 'string', short: 'n', value: 'N', help: 'Number of frames in the sequence. Default 1.' },
  interval: { type: 'string', value: 'SECONDS', help: 'Time between frames, seconds. Default 0.04 (25 frames a second).' },
  workers: { type: 'string', short: 'w', value: 'N', help: 'Worker threads; 1 runs in this thread. Default: one per core.' },
  redo: { type: 'boolean', help: 'Simulate every frame again, even those already written.' },
  quiet: { type: 'boolean', short: 'q', help: 'No progress bar and no summary line.' },
  help: { type: 'boolean', short: 'h', help: 'Show this help.' },
};

/** The help of `simulate`. */
export const SIMULATE_HELP: CommandHelp = {
  name: 'simulate',
  summary: 'simulate a scenario into a folder of sensor frames, scene images and truth',
  usage: ['simulate SCENARIO.json --out DIR [--count N] [--interval SECONDS] [--workers N]', 'simulate --preset tank|harbour --out DIR [--count N]'],
  description: [
    'Reads a scenario (an invented site and time, the sea state, the guide light, the slope sensor and its camera, the scene camera and its target; ' +
      '"meniscus schema scenario" prints the schema, "meniscus schema scenario --example" an example) and simulates a sequence of frames: ' +
      'frame n shows the sea at time t0 + n × interval, with its own sensor noise.',
    'Writes OUT/frames/frame_NNNN.png (the sensor frames, 16-bit, counts as codes), OUT/scenes/frame_NNNN.png (the scene seen through the waves, 16-bit linear), ' +
      'OUT/truth/frame_NNNN/ (the true height and slopes as .npy with meta.json, and the scene through flat water), OUT/scenario.json (the scenario with its defaults) ' +
      'and OUT/run.json, a run configuration with which "meniscus process" measures the frames exactly as the simulator set the sensor up.',
    'Running again skips the frames already written for the same scenario; --redo writes them all again.',
  ],
  options: OPTIONS,
  examples: [
    ['ten frames of the shipped wave-tank scenario', 'simulate --preset tank --out sim --count 10'],
    ['your own scenario, 100 frames at 50 frames a second, then process them', 'simulate my-tank.json -o sim -n 100 --interval 0.02'],
    ['… and process them', 'process sim/run.json --frames sim/frames --scenes sim/scenes --out sim/results'],
  ],
};

/**
 * Run `simulate`.
 *
 * @param argv - Arguments after the subcommand.
 * @param io - Streams and folder.
 * @returns The exit code: 0, or 1 when some frames failed.
 * @throws {@link UsageError}, `ConfigValidationError`, the library's errors for a
 *   scenario the simulator refuses, or file-system errors (mapped to exit codes by the
 *   caller).
 * @example
 * ```ts
 * await runSimulate(['--preset', 'tank', '--out', 'sim', '--count', '4'], { stdout: process.stdout, stderr: process.stderr });
 * ```
 */
export async function runSimulate(argv: readonly string[], io: CliIO): Promise<number> {
  const { values, positionals } = parseCommandArgs('simulate', argv, OPTIONS);
  if (values.help) {
    io.stdout.write(formatCommandHelp(SIMULATE_HELP));
    return EXIT_CODES.ok;
  }
  const cwd = io.cwd ?? process.cwd();
  let raw: unknown;
  if (typeof values.preset === 'string') {
    if (positionals.length > 0) throw new UsageError('give either a scenario file or --preset, not both', 'simulate');
    if (values.preset === 'tank') raw = tankScenario();
    else if (values.preset === 'harbour') raw = harbourScenario();
    else throw new UsageError(`--preset must be "tank" or "harbour"; got ${JSON.stringify(values.preset)}`, 'simulate');
    validateConfig('scenario', raw, `preset ${values.preset}`);
  } else {
    if (positionals.length !== 1) throw new UsageError(`expected one scenario file (or --preset); got ${positionals.length}`, 'simulate');
    raw = readConfigFile('scenario', resolve(cwd, positionals[0]!));
  }
  if (typeof values.out !== 'string') throw new UsageError('--out is required', 'simulate');
  const count = intOption('simulate', 'count', values.count, 1, 1_000_000) ?? 1;
  const workers = intOption('simulate', 'workers', values.workers, 1, 1024) ?? availableParallelism();
  let interval = 0.04;
  if (values.interval !== undefined) {
    interval = Number(values.interval);
    if (typeof values.interval !== 'string' || !(interval > 0 && Number.isFinite(interval))) {
      throw new UsageError(`--interval must be a number of seconds > 0; got ${JSON.stringify(values.interval)}`, 'simulate');
    }
  }
  const { $schema: _s, ...rest } = raw as Scenario & { $schema?: string };
  const scenario: Scenario = validateScenario(rest);
  const outDir = resolve(cwd, values.out);
  const configHash = createHash('sha256').update(JSON.stringify({ scenario, interval })).digest('hex').slice(0, 16);
  const setup: SimulateJobSetup = { scenario, outDir, interval, configHash };
  const digits = Math.max(4, String(count - 1).length);
  const tasks: SimulateTask[] = [];
  let skipped = 0;
  for (let k = 0; k < count; k++) {
    const stem = `frame_${String(k).padStart(digits, '0')}`;
    const meta = join(outDir, SIMULATE_FOLDERS.truth, stem, 'meta.json');
    if (!values.redo && existsSync(meta)) {
      let hash: unknown;
      try {
        hash = (JSON.parse(readFileSync(meta, 'utf8')) as { meta?: { configHash?: unknown } }).meta?.configHash;
      } catch {
        hash = undefined;
      }
      if (hash === configHash && existsSync(join(outDir, SIMULATE_FOLDERS.frames, `${stem}.png`)) && existsSync(join(outDir, SIMULATE_FOLDERS.scenes, `${stem}.png`))) {
        skipped++;
        continue;
      }
      if (hash !== undefined && hash !== configHash) {
        throw new UsageError(`${relative(cwd, join(outDir, SIMULATE_FOLDERS.truth, stem))} was simulated from another scenario; use --redo to replace it, or another --out`, 'simulate');
      }
    }
    tasks.push({ index: k, stem });
  }
  for (const f of Object.values(SIMULATE_FOLDERS)) {
    mkdirSync(join(outDir, f), { recursive: true });
    removePartials(join(outDir, f));
  }
  writeFileSync(join(outDir, 'scenario.json'), JSON.stringify(scenario, null, 2) + '\n');
  const job = prepareSimulateJob(setup);
  const quiet = values.quiet === true;
  const { outcomes, seconds, used } = await runFrames<SimulateTask, SimulateSummary>({ tasks, workers, workerData: { job: 'simulate', setup }, job, io, quiet });
  let failed = 0;
  outcomes.forEach((o, k) => {
    if (!o.ok) {
      failed++;
      io.stderr.write(`frame ${tasks[k]!.stem} failed: ${o.error}\n`);
    } else if (o.value.run !== undefined) {
      writeFileSync(join(outDir, 'run.json'), JSON.stringify(o.value.run, null, 2) + '\n');
    }
  });
  if (!quiet) {
    io.stdout.write(
      `${tasks.length - failed} of ${count} frames simulated, ${skipped} already written, ${failed} failed; ${seconds.toFixed(2)} s with ${used} worker${used === 1 ? '' : 's'}\n` +
        `next: meniscus process ${relative(cwd, join(outDir, 'run.json')) || 'run.json'} --frames ${relative(cwd, join(outDir, SIMULATE_FOLDERS.frames))} ` +
        `--scenes ${relative(cwd, join(outDir, SIMULATE_FOLDERS.scenes))} --out ${relative(cwd, join(outDir, 'results'))}\n`,
    );
  }
  return failed > 0 ? EXIT_CODES.framesFailed : EXIT_CODES.ok;
}
