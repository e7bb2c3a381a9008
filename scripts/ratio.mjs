// Paired speed ratios: the library's bench cases against their numpy/scipy peers, run
// alternately in one script so that both sides of each ratio see the same machine state.
//
//   npm run bench:ratio -- [--pairs N] [--repeat R] [--peers PATH] case …
//
// Each pair runs the compiled bench runner (`--json`) and the peer script
// (`python3 PATH --repeat R case`) once each, the order swapped from pair to pair, and
// prints the ratio of their medians (library ÷ peer) and of their minima; the summary is
// the median over the pairs. Shared or virtual machines change speed in phases lasting
// seconds, so one library run set against one peer run from another minute can be off by
// a third either way; pairing them is the reading to report.
//
// The peers live outside the repository (default `../shared/peers/peers.py`, beside the
// checkout) and need python3 with numpy and scipy; nothing in `npm test` or CI uses this
// script.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
let pairs = 5;
let repeat = 0; // 0: the peer's default
let peers = join(root, '..', 'shared', 'peers', 'peers.py');
const cases = [];
for (let i = 0; i < args.length; i++) {
  const a = args[i];
  const value = () => {
    const v = args[++i];
    if (v === undefined) fail(`${a} needs a value`);
    return v;
  };
  if (a === '--pairs') pairs = count(a, value());
  else if (a === '--repeat') repeat = count(a, value());
  else if (a === '--peers') peers = value();
  else if (a.startsWith('--')) fail(`unknown option ${a} (expected --pairs, --repeat or --peers)`);
  else cases.push(a);
}
if (cases.length === 0) fail('name at least one bench case with a peer, e.g. optics.refract');
if (!existsSync(peers)) fail(`peer script not found at ${peers} (give its path with --peers)`);

function fail(message) {
  console.error(`bench:ratio: ${message}`);
  process.exit(2);
}

function count(option, text) {
  const n = Number(text);
  if (!Number.isInteger(n) || n < 1) fail(`${option} must be a positive integer, got ${JSON.stringify(text)}`);
  return n;
}

/** The JSON lines of a run, by case name; exits when the command fails. */
function run(cmd, argv) {
  const r = spawnSync(cmd, argv, { cwd: root, encoding: 'utf8', maxBuffer: 1 << 24 });
  if (r.status !== 0) fail(`${cmd} ${argv.join(' ')} failed (exit ${r.status}):\n${r.stderr}`);
  const byCase = new Map();
  for (const line of r.stdout.split('\n')) {
    if (!line.startsWith('{')) continue;
    const o = JSON.parse(line);
    byCase.set(o.case, o);
  }
  return byCase;
}

// Compile once with the bench script, then run the compiled runner directly.
const runner = join(root, 'node_modules', '.cache', 'meniscus-bench', 'bench', 'run.js');
let compiled = false;
function library(name) {
  const r = compiled
    ? run(process.execPath, [runner, '--json', name])
    : run(process.execPath, [join(root, 'scripts', 'bench.mjs'), '--json', name]);
  compiled = true;
  const o = r.get(name);
  if (o === undefined) fail(`the bench has no case named ${name}`);
  return o;
}
function peer(name) {
  const o = run('python3', [peers, ...(repeat > 0 ? ['--repeat', String(repeat)] : []), name]).get(name);
  if (o === undefined) fail(`the peer script has no case named ${name}`);
  return o;
}

const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m] : 0.5 * (s[m - 1] + s[m]);
};
const ms = (x) => x.toFixed(x < 10 ? 2 : 1).padStart(8);

for (const name of cases) {
  console.log(`${name}: ${pairs} pairs (library ÷ peer, the order swapped each pair)`);
  console.log('  pair  library med/min ms    peer med/min ms   ratio med   ratio min');
  const rMed = [], rMin = [];
  for (let k = 0; k < pairs; k++) {
    let lib, ref;
    if (k % 2 === 0) {
      lib = library(name);
      ref = peer(name);
    } else {
      ref = peer(name);
      lib = library(name);
    }
    rMed.push(lib.median_ms / ref.median_ms);
    rMin.push(lib.min_ms / ref.min_ms);
    console.log(`  ${String(k + 1).padStart(4)}  ${ms(lib.median_ms)} ${ms(lib.min_ms)}  ${ms(ref.median_ms)} ${ms(ref.min_ms)}   ${rMed[k].toFixed(3).padStart(9)}   ${rMin[k].toFixed(3).padStart(9)}`);
  }
  console.log(`  median over pairs: ratio of medians ${median(rMed).toFixed(3)}, ratio of minima ${median(rMin).toFixed(3)} (range ${Math.min(...rMed).toFixed(3)}–${Math.max(...rMed).toFixed(3)})`);
}
