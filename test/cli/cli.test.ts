import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync, existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { COMMANDS, runCli } from '../../src/node/cli/run.js';
import { EXIT_CODES } from '../../src/node/cli/exit-codes.js';
import { EXAMPLE_RUN, EXAMPLE_SENSOR_DESIGN } from '../../src/node/schemas/index.js';
import { readFrameResult } from '../../src/node/frame-result.js';
import { smallTankScenario } from './helpers.js';

const MAIN = new URL('../../src/node/cli/main.ts', import.meta.url);
const TSX = pathToFileURL(createRequire(import.meta.url).resolve('tsx')).href;

/** Run the CLI in this process with captured streams. */
async function cli(args: string[], cwd: string): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await runCli(args, { stdout: { write: (t: string) => (out += t) }, stderr: { write: (t: string) => (err += t), isTTY: false }, cwd });
  return { code, out, err };
}

/** Every file under a folder, relative paths, sorted. */
function files(dir: string, prefix = ''): string[] {
  const out: string[] = [];
  for (const e of readdirSync(join(dir, prefix), { withFileTypes: true })) {
    const rel = prefix ? `${prefix}/${e.name}` : e.name;
    if (e.isDirectory()) out.push(...files(dir, rel));
    else out.push(rel);
  }
  return out.sort();
}

let dir: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'meniscus-cli-'));
  writeFileSync(join(dir, 'small-tank.json'), JSON.stringify(smallTankScenario(), null, 2));
  const r = await cli(['simulate', 'small-tank.json', '--out', 'sim', '--count', '6', '--workers', '2'], dir);
  if (r.code !== 0) throw new Error(`simulate failed: ${r.err}`);
  // A run without scene correction, for the tests that need only the surfaces.
  const run = JSON.parse(readFileSync(join(dir, 'sim', 'run.json'), 'utf8'));
  delete run.correct;
  writeFileSync(join(dir, 'run.json'), JSON.stringify(run));
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe('meniscus command line: help', () => {
  it.each(COMMANDS.map((c) => c.name))('%s --help shows usage, examples and exit codes', async (name) => {
    const r = await cli([name, '--help'], dir);
    expect(r.code).toBe(EXIT_CODES.ok);
    expect(r.out).toContain(`meniscus ${name}`);
    expect(r.out).toContain('Usage:');
    expect(r.out).toContain('Examples:');
    expect(r.out).toContain('Exit codes:');
    expect(r.err).toBe('');
    expect((await cli(['help', name], dir)).out).toBe(r.out);
  });

  it('the top-level help lists every command; an unknown command is a usage error', async () => {
    const r = await cli(['--help'], dir);
    for (const c of COMMANDS) expect(r.out).toContain(c.name);
    const bad = await cli(['proces'], dir);
    expect(bad.code).toBe(EXIT_CODES.usage);
    expect(bad.err).toMatch(/unknown command "proces"/);
  });

  it('runs as a real program: exit codes reach the shell', () => {
    const ok = spawnSync(process.execPath, ['--import', TSX, MAIN.pathname, '--version'], { encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(ok.stdout.trim()).toMatch(/^\d+\.\d+\.\d+/);
    const bad = spawnSync(process.execPath, ['--import', TSX, MAIN.pathname, 'design', '--nope'], { encoding: 'utf8' });
    expect(bad.status).toBe(EXIT_CODES.usage);
    expect(bad.stderr).toMatch(/meniscus design: Unknown option '--nope'/);
  });
});

describe('meniscus design', () => {
  it('prints the budget and warnings of a sensor description', async () => {
    writeFileSync(join(dir, 'design.json'), JSON.stringify(EXAMPLE_SENSOR_DESIGN));
    const r = await cli(['design', 'design.json'], dir);
    expect(r.code).toBe(EXIT_CODES.ok);
    expect(r.out).toMatch(/spot diameter\s+0\.\d+ mm/);
    expect(r.out).toMatch(/warnings\s+none/);
    const j = await cli(['design', 'design.json', '--json'], dir);
    expect(JSON.parse(j.out).spot.total).toBeGreaterThan(0);
  });

  it('--strict exits 1 when the design has warnings', async () => {
    writeFileSync(join(dir, 'steep.json'), JSON.stringify({ ...EXAMPLE_SENSOR_DESIGN, planeDistance: 0.15, pitch: 0.03, sea: { meanSquareSlope: 0.04, shortestWavelength: 0.04 } }));
    const r = await cli(['design', 'steep.json', '--strict'], dir);
    expect(r.out).toMatch(/warning: /);
    expect(r.code).toBe(EXIT_CODES.framesFailed);
  });

  it('a broken sensor description gives the field, value and expectation, exit code 2', async () => {
    writeFileSync(join(dir, 'broken.json'), JSON.stringify({ ...EXAMPLE_SENSOR_DESIGN, pitch: -0.008, lattice: 'hex' }));
    const r = await cli(['design', 'broken.json'], dir);
    expect(r.code).toBe(EXIT_CODES.usage);
    expect(r.err).toContain('2 problems in the sensor-design configuration');
    expect(r.err).toContain('/pitch: expected a number > 0; got -0.008');
    expect(r.err).toContain('/lattice: expected one of "square", "hexagonal"; got "hex"');
    expect(r.out).toBe('');
  });

  it('a missing file is an I/O error, exit code 3', async () => {
    const r = await cli(['design', 'no-such-file.json'], dir);
    expect(r.code).toBe(EXIT_CODES.io);
    expect(r.err).toMatch(/ENOENT/);
  });
});

describe('meniscus schema', () => {
  it('prints a schema, an example that validates with --check, and the kinds', async () => {
    const s = await cli(['schema', 'run'], dir);
    expect(JSON.parse(s.out).$id).toBe('meniscus:run');
    const e = await cli(['schema', 'light', '--example'], dir);
    writeFileSync(join(dir, 'lamp.json'), e.out);
    const c = await cli(['schema', 'light', '--check', 'lamp.json'], dir);
    expect(c.code).toBe(EXIT_CODES.ok);
    expect((await cli(['schema', '--list'], dir)).out.split('\n')).toContain('scenario');
    expect((await cli(['schema', 'lamp'], dir)).code).toBe(EXIT_CODES.usage);
  });
});

describe('meniscus process', () => {
  it('simulate writes frames, scene images, truth and a matching run file; two workers write the same files as one', async () => {
    expect(files(join(dir, 'sim', 'frames'))).toEqual(['frame_0000.png', 'frame_0001.png', 'frame_0002.png', 'frame_0003.png', 'frame_0004.png', 'frame_0005.png']);
    expect(files(join(dir, 'sim', 'scenes'))).toHaveLength(6);
    const truth = readFrameResult(join(dir, 'sim', 'truth', 'frame_0002'));
    expect(truth.meta).toMatchObject({ index: 2, noiseSeed: 9 + 2 });
    expect(truth.meta.time).toBeCloseTo(0.08, 12);
    expect(truth.slopeX).not.toBeNull();
    const one = await cli(['simulate', 'small-tank.json', '-o', 'sim1', '-n', '3', '-w', '1'], dir);
    expect(one.code).toBe(EXIT_CODES.ok);
    for (const f of files(join(dir, 'sim1'))) expect(readFileSync(join(dir, 'sim1', f)).equals(readFileSync(join(dir, 'sim', f))), f).toBe(true);
    // Resumable: the frames already written are skipped.
    const again = await cli(['simulate', 'small-tank.json', '-o', 'sim1', '-n', '4', '-w', '1'], dir);
    expect(again.out).toMatch(/1 of 4 frames simulated, 3 already written/);
  });

  it('two workers give bit-identical results to one (surfaces and corrected images), and a second run resumes', async () => {
    const one = await cli(['process', 'sim/run.json', '--frames', 'sim/frames', '--scenes', 'sim/scenes', '--truth', 'sim/truth', '--out', 'out1', '--workers', '1'], dir);
    expect(one.err).toBe('');
    expect(one.code).toBe(EXIT_CODES.ok);
    const two = await cli(['process', 'sim/run.json', '--frames', 'sim/frames/frame_%04d.png', '--scenes', 'sim/scenes/frame_%04d.png', '--truth', 'sim/truth', '--out', 'out2', '--workers', '2'], dir);
    expect(two.code).toBe(EXIT_CODES.ok);
    expect(two.out).toMatch(/6 of 6 frames processed, 0 already done, 0 failed; .* with 2 workers/);
    const a = files(join(dir, 'out1', 'frames')), b = files(join(dir, 'out2', 'frames'));
    expect(a).toHaveLength(6 * 5);
    expect(a).toContain('frame_0005/corrected.png');
    expect(b).toEqual(a);
    for (const f of a) expect(readFileSync(join(dir, 'out2', 'frames', f)).equals(readFileSync(join(dir, 'out1', 'frames', f))), f).toBe(true);
    const r = readFrameResult(join(dir, 'out1', 'frames', 'frame_0003'));
    expect(r.meta.spotsMatched).toBe(144);
    expect(r.meta.correctedPixels).toBeGreaterThan(0);
    // Scored against the truth: the measurement beats assuming flat water.
    const scores = r.meta.scores as { heightRms: number; truthRms: number; ssimCorrected: number };
    expect(scores.heightRms).toBeLessThan(scores.truthRms);
    expect(scores.ssimCorrected).toBeGreaterThan(0);
    const report = JSON.parse(readFileSync(join(dir, 'out2', 'report.json'), 'utf8'));
    expect(report.summary).toMatchObject({ frames: 6, processed: 6, failed: 0, skipped: 0 });
    for (const f of ['report-height.png', 'report-slopes.svg', 'report-histogram.svg', 'report.md']) expect(existsSync(join(dir, 'out2', f)), f).toBe(true);
    // Resume: nothing left to do.
    const again = await cli(['process', 'sim/run.json', '-f', 'sim/frames', '-s', 'sim/scenes', '--truth', 'sim/truth', '-o', 'out2', '-w', '2'], dir);
    expect(again.out).toMatch(/0 of 6 frames processed, 6 already done/);
    // --redo does them again.
    const redo = await cli(['process', 'sim/run.json', '-f', 'sim/frames', '-s', 'sim/scenes', '--truth', 'sim/truth', '-o', 'out2', '-w', '2', '--redo', '--limit', '2'], dir);
    expect(redo.out).toMatch(/2 of 2 frames processed/);
  });

  it('an interrupted run leaves no half-written frame behind once it is run again', async () => {
    const stale = join(dir, 'out1', 'frames', 'frame_0001.partial-99-abcdef');
    mkdirSync(stale, { recursive: true });
    writeFileSync(join(stale, 'height.npy'), 'half');
    const r = await cli(['process', 'sim/run.json', '-f', 'sim/frames', '-s', 'sim/scenes', '--truth', 'sim/truth', '-o', 'out1', '-w', '1'], dir);
    expect(r.out).toMatch(/0 of 6 frames processed, 6 already done/);
    expect(existsSync(stale)).toBe(false);
  });

  it('refuses to mix results of another configuration into an output folder', async () => {
    const run = JSON.parse(readFileSync(join(dir, 'sim', 'run.json'), 'utf8'));
    writeFileSync(join(dir, 'run-b.json'), JSON.stringify({ ...run, reconstruct: { maxIterations: 1 } }));
    const r = await cli(['process', 'run-b.json', '-f', 'sim/frames', '-s', 'sim/scenes', '--truth', 'sim/truth', '-o', 'out1', '-w', '1'], dir);
    expect(r.code).toBe(EXIT_CODES.usage);
    expect(r.err).toMatch(/written with another configuration; use --redo/);
    // Leaving out the scene images changes what a frame holds, so it counts as another configuration too.
    const noScenes = await cli(['process', 'sim/run.json', '-f', 'sim/frames', '--truth', 'sim/truth', '-o', 'out1', '-w', '1'], dir);
    expect(noScenes.code).toBe(EXIT_CODES.usage);
  });

  it('a failed frame is reported, the others are written, and the exit code is 1', async () => {
    mkdirSync(join(dir, 'mixed'), { recursive: true });
    for (const f of ['frame_0000.png', 'frame_0001.png']) writeFileSync(join(dir, 'mixed', f), readFileSync(join(dir, 'sim', 'frames', f)));
    writeFileSync(join(dir, 'mixed', 'frame_0002.png'), 'not a png');
    const r = await cli(['process', 'run.json', '-f', 'mixed', '-o', 'out-mixed', '-w', '2'], dir);
    expect(r.code).toBe(EXIT_CODES.framesFailed);
    expect(r.err).toMatch(/frame frame_0002 failed: .*PNG/);
    const report = JSON.parse(readFileSync(join(dir, 'out-mixed', 'report.json'), 'utf8'));
    expect(report.frames.map((f: { status: string }) => f.status)).toEqual(['ok', 'ok', 'failed']);
    expect(existsSync(join(dir, 'out-mixed', 'frames', 'frame_0001', 'meta.json'))).toBe(true);
    expect(readFileSync(join(dir, 'out-mixed', 'report.md'), 'utf8')).toMatch(/frame_0002 \| \*\*failed\*\*/);
  });

  it('a broken scenario gives the field, value and expectation, exit code 2', async () => {
    const bad = smallTankScenario() as unknown as Record<string, Record<string, unknown>>;
    bad.sea!.gridSize = 100;
    bad.sensor!.pitch = '1 cm';
    writeFileSync(join(dir, 'bad-scenario.json'), JSON.stringify(bad));
    const r = await cli(['simulate', 'bad-scenario.json', '-o', 'sim-bad'], dir);
    expect(r.code).toBe(EXIT_CODES.usage);
    expect(r.err).toContain('2 problems in the scenario configuration');
    expect(r.err).toContain('/sea/gridSize: expected one of 16, 32, 64, 128, 256, 512, 1024, 2048, 4096; got 100');
    expect(r.err).toContain('/sensor/pitch: expected a number in [0.0001, 1]; got "1 cm"');
  });

  it('a broken run configuration gives the documented message and exit code 2, before any work', async () => {
    writeFileSync(join(dir, 'bad-run.json'), JSON.stringify({ ...EXAMPLE_RUN, camera: { kind: 'plane', width: 0, height: 64 }, detect: { methd: 'iterative' } }));
    const r = await cli(['process', 'bad-run.json', '-f', 'sim/frames', '-o', 'out-bad'], dir);
    expect(r.code).toBe(EXIT_CODES.usage);
    expect(r.err).toContain('meniscus process: invalid configuration');
    expect(r.err).toContain('/camera/width: expected an integer in [1, 65536]; got 0');
    expect(r.err).toContain('/camera/pixelSize: expected a value (this field is required); it is missing');
    expect(r.err).toContain('/detect/methd: expected no field "methd" here');
    expect(r.err).toContain('did you mean "method"?');
    expect(existsSync(join(dir, 'out-bad'))).toBe(false);
  });

  it('usage errors: missing --out, a bad worker count, no frames', async () => {
    expect((await cli(['process', 'run.json', '-f', 'sim/frames'], dir)).err).toMatch(/--out is required/);
    expect((await cli(['process', 'run.json', '-f', 'sim/frames', '-o', 'x', '-w', '0'], dir)).code).toBe(EXIT_CODES.usage);
    expect((await cli(['process', 'run.json', '-f', 'sim/frames', '-s', 'sim/scenes', '-o', 'x'], dir)).err).toMatch(/--scenes needs a "correct" section/);
    mkdirSync(join(dir, 'empty'), { recursive: true });
    expect((await cli(['process', 'run.json', '-f', 'empty', '-o', 'x'], dir)).err).toMatch(/holds no .png or .npy image/);
    expect((await cli(['process', 'run.json', '-f', 'missing-folder', '-o', 'x'], dir)).code).toBe(EXIT_CODES.io);
  });
});
