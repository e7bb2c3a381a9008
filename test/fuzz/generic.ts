/**
 * The generic layer: every callable export of every area gets random junk for every
 * parameter; so do the methods of well-formed library objects (cameras, surfaces,
 * lights, prepared integrators …). Shared by the `generic-*.test.ts` files, which split
 * the areas between test workers.
 */
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { areaNames, callables, isInternal, SRC, documentsNonFinite, loadArea, type Callable } from './exports.js';
import { describeArgs, judgeCall, namingFindings, parameterNames, type CallPolicy } from './harness.js';
import { addLibrarySamples, argsFor, LIBRARY_SAMPLES, SCRATCH } from './junk.js';
import { HELPER_ARGS, KERNEL_METHODS, OPEN_DEFECTS, OPEN_METHOD_DEFECTS, policyFor, SIDE_EFFECTS, UNCHECKED_KERNELS } from './policy.js';
import { buildSamples } from './samples.js';

/** Members declared `private` or `protected` anywhere in src (not part of the public surface). */
const PRIVATE_MEMBERS: ReadonlySet<string> = (() => {
  const names = new Set<string>();
  const walk = (d: string): void => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (p.endsWith('.ts')) for (const m of readFileSync(p, 'utf8').matchAll(/\b(?:private|protected)\s+(?:readonly\s+)?([A-Za-z0-9_]+)\s*\(/g)) names.add(m[1]!);
    }
  };
  walk(SRC);
  return names;
})();

/** Cases per export in the generic layer. */
export const GENERIC_RUNS = Number(process.env.FUZZ_RUNS ?? 120);
const SEED = 20240609;

/** Running totals, printed at the end of each file. */
export const tally = { callables: 0, covered: 0, skipped: [] as string[], cases: 0, libraryErrors: 0, ok: 0 };

const kernelArg = fc.oneof(
  fc.array(fc.double(), { minLength: 3, maxLength: 3 }),
  fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: 9, maxLength: 9 }),
  fc.double(),
);

/** Run `f` on `runs` argument lists and return the distinct defects (first example of each). */
export function fuzzCallable(
  label: string,
  f: Function,
  arbitrary: fc.Arbitrary<unknown[]>,
  policy: CallPolicy,
  options: { runs: number; seed: number; construct?: boolean; thisArg?: unknown },
): string[] {
  const seen = new Map<string, string>();
  const samples = fc.sample(arbitrary, { seed: options.seed, numRuns: options.runs });
  for (const args of samples) {
    const shown = describeArgs(args); // before the call: the call might (wrongly) change them
    const o = judgeCall(label, f, args, policy, options.construct ?? false, options.thisArg);
    tally.cases++;
    if (o.kind === 'ok') tally.ok++;
    else if (o.kind === 'library-error') tally.libraryErrors++;
    else {
      const key = o.why!.replace(/\d+(\.\d+)? ms/, 'N ms').replace(/byte \d+|\[\d+\]/g, '[k]').slice(0, 90);
      if (!seen.has(key)) seen.set(key, `${label}(${shown.slice(0, 300)}) → ${o.why}`);
    }
  }
  return [...seen.values()];
}

function policyOf(c: Callable): CallPolicy {
  const names = parameterNames(c.fn);
  const base = policyFor(c.area, c.name, documentsNonFinite(c.name, c.area), names[0]);
  if (c.area === 'node') return { ...base, systemErrorsOk: true, outArgs: names.flatMap((n, k) => (/^out$/.test(n) ? [k] : [])) };
  const outArgs = names.flatMap((n, k) => (/^out$/.test(n) ? [k] : []));
  return { ...base, outArgs };
}

/** Describe one `it` per callable export of the given areas. */
export async function genericSuite(areasWanted: (area: string) => boolean): Promise<void> {
  const all = areaNames();
  const loaded = new Map<string, Record<string, unknown> | null>();
  const failures = new Map<string, string>();
  for (const a of all) {
    const { module, error } = await loadArea(a);
    loaded.set(a, module);
    if (error) failures.set(a, error);
  }
  addLibrarySamples(() => buildSamples(loaded));

  for (const area of all.filter(areasWanted)) {
    describe(`fuzz: every export of src/${area}`, () => {
      const mod = loaded.get(area);
      if (!mod) {
        it(`loads (${failures.get(area)})`, () => {
          tally.skipped.push(`${area}/* (index does not load)`);
        });
        return;
      }
      for (const c of callables(area, mod)) {
        tally.callables++;
        const key = `${area}/${c.name}`;
        if (isInternal(c.area, c.name)) {
          it.skip(`${c.name}: marked @internal, not public API (leaks through the index)`, () => undefined);
          tally.skipped.push(`${key} (@internal)`);
          continue;
        }
        if (SIDE_EFFECTS[key]) {
          it.skip(`${c.name}: not fuzzed (${SIDE_EFFECTS[key]})`, () => undefined);
          tally.skipped.push(`${key} (side effects)`);
          continue;
        }
        if (OPEN_DEFECTS[key]) {
          it.skip(`${c.name}: open defect, reported (${OPEN_DEFECTS[key]})`, () => undefined);
          tally.skipped.push(key);
          continue;
        }
        tally.covered++;
        it(`${c.name}${c.isClass ? ' (constructor)' : ''} survives junk`, () => {
          const names = parameterNames(c.fn);
          const helper = c.area === 'core' ? HELPER_ARGS[c.name] : undefined;
          const arb = helper
            ? helper
            : UNCHECKED_KERNELS.has(c.name)
              ? fc.tuple(...Array.from({ length: Math.max(names.length, c.fn.length) }, () => kernelArg))
              : argsFor(names, c.fn.length);
          const defects = fuzzCallable(c.name, c.fn, arb, policyOf(c), { runs: GENERIC_RUNS, seed: SEED, construct: c.isClass });
          expect(defects, defects.join('\n')).toEqual([]);
        });
      }
    });
  }
}

/** Describe one `it` per method of each library sample object whose area is wanted. */
export function methodSuite(): void {
  describe('fuzz: methods of library objects', () => {
    const objs = LIBRARY_SAMPLES.filter((s) => s !== null && typeof s === 'object');
    const seenMethods = new Set<string>();
    for (const obj of objs) {
      const ctor = (obj as object).constructor?.name;
      const proto = Object.getPrototypeOf(obj) as object;
      const names = new Set<string>([...Object.keys(obj as object), ...(proto && proto !== Object.prototype ? Object.getOwnPropertyNames(proto) : [])]);
      const kind = ctor && ctor !== 'Object' ? ctor : `{${Object.keys(obj as object).slice(0, 3).join(',')}}`;
      for (const m of [...names].sort()) {
        if (m === 'constructor' || PRIVATE_MEMBERS.has(m)) continue;
        const f = (obj as Record<string, unknown>)[m];
        if (typeof f !== 'function') continue;
        const label = `${kind}.${m}`;
        if (seenMethods.has(label)) continue;
        seenMethods.add(label);
        tally.callables++;
        if (OPEN_METHOD_DEFECTS[label]) {
          it.skip(`${label}: open defect, reported (${OPEN_METHOD_DEFECTS[label]})`, () => undefined);
          tally.skipped.push(label);
          continue;
        }
        tally.covered++;
        const kernel = KERNEL_METHODS.test(label);
        it(`${label} survives junk`, () => {
          const pn = parameterNames(f as Function);
          const policy: CallPolicy = {
            nonFiniteOk: kernel || documentsNonFinite(m),
            outArgs: pn.flatMap((n, k) => (n === 'out' ? [k] : [])),
            timeLimitMs: 1500,
          };
          const arb = kernel
            ? fc.tuple(...pn.map((n) => (n === 'out' ? fc.constant(null).map(() => new Float64Array(2)) : fc.double())))
            : argsFor(pn, (f as Function).length);
          const defects = fuzzCallable(label, f as Function, arb, policy, {
            runs: Math.ceil(GENERIC_RUNS / 2),
            seed: SEED + 1,
            thisArg: obj,
          });
          expect(defects, defects.join('\n')).toEqual([]);
        });
      }
    }
  });
}

/** Print the tally once the file's tests are done. */
export function printTally(file: string): void {
  afterAll(() => {
    rmSync(SCRATCH, { recursive: true, force: true });
    const lines = [
      `[fuzz ${file}] callables ${tally.callables}, covered ${tally.covered}, skipped ${tally.skipped.length}${tally.skipped.length ? ` (${tally.skipped.join(', ')})` : ''}`,
      `[fuzz ${file}] cases ${tally.cases}: returned ${tally.ok}, library errors ${tally.libraryErrors}, defects ${tally.cases - tally.ok - tally.libraryErrors}`,
    ];
    if (namingFindings.size) {
      lines.push(`[fuzz ${file}] errors naming an undeclared parameter (soft): ${namingFindings.size}`);
      for (const [k, v] of namingFindings) lines.push(`  ${k}: ${v}`);
    }
    console.log(lines.join('\n'));
  });
}
