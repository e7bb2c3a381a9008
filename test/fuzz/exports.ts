/**
 * Walk the exports of every `src/<area>/index.ts` so that fuzz coverage is counted, not
 * hand-picked, and read each export's TSDoc to learn whether it documents NaN (or other
 * non-finite numbers) in its result.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const SRC = resolve(dirname(fileURLToPath(import.meta.url)), '../../src');

/** One callable export. */
export interface Callable {
  readonly area: string;
  readonly name: string;
  readonly fn: Function;
  readonly isClass: boolean;
}

/** The areas that have an index, in a stable order. */
export function areaNames(): string[] {
  return readdirSync(SRC)
    .filter((d) => statSync(join(SRC, d)).isDirectory() && existsSync(join(SRC, d, 'index.ts')))
    .sort();
}

/** Load an area's index; `null` with the error when it does not load (an area still being written). */
export async function loadArea(area: string): Promise<{ module: Record<string, unknown> | null; error?: string }> {
  try {
    const module = (await import(/* @vite-ignore */ join(SRC, area, 'index.ts'))) as Record<string, unknown>;
    return { module };
  } catch (e) {
    return { module: null, error: String(e).slice(0, 300) };
  }
}

/** The callable exports of a module (functions and classes), sorted by name. */
export function callables(area: string, module: Record<string, unknown>): Callable[] {
  return Object.keys(module)
    .sort()
    .filter((k) => typeof module[k] === 'function')
    .map((name) => {
      const fn = module[name] as Function;
      return { area, name, fn, isClass: /^class\b/.test(Function.prototype.toString.call(fn)) };
    });
}

let docCache: Map<string, string> | null = null;
const internalNames = new Set<string>();

/** Whether an export is marked `@internal` in its TSDoc (exported by an index but not public API). */
export function isInternal(area: string, name: string): boolean {
  docs();
  return internalNames.has(`${area}/${name}`) || (!internalNames.has(`${area}/${name}`) && !docCache!.has(`${area}/${name}`) && internalNames.has(name));
}

function allSources(dir: string, out: string[] = []): string[] {
  for (const e of readdirSync(dir)) {
    const p = join(dir, e);
    if (statSync(p).isDirectory()) allSources(p, out);
    else if (p.endsWith('.ts')) out.push(p);
  }
  return out;
}

/** Map export name → its TSDoc plus the TSDoc of its declared return type (and that type's fields). */
function docs(): Map<string, string> {
  if (docCache) return docCache;
  const files = allSources(SRC);
  const texts = files.map((p) => readFileSync(p, 'utf8'));
  const areaOf = files.map((p) => p.slice(SRC.length + 1).split(/[\\/]/)[0]!);
  const typeDocs = new Map<string, string>();
  const fnDocs = new Map<string, { doc: string; returns: string }>();
  const decl = /\/\*\*((?:(?!\*\/)[\s\S])*)\*\/\s*export\s+(?:declare\s+)?(function|class|interface|type)\s+([A-Za-z0-9_]+)/g;
  for (let fi = 0; fi < texts.length; fi++) {
    const t = texts[fi]!;
    for (const m of t.matchAll(decl)) {
      const [, doc, kind, name] = m as unknown as [string, string, string, string];
      if (kind === 'interface' || kind === 'type') {
        // the type's own doc and the body up to the next top-level declaration
        const start = m.index! + m[0].length;
        const end = t.indexOf('\n}', start);
        typeDocs.set(name, doc + (end > 0 ? t.slice(start, end) : ''));
      } else {
        const start = m.index! + m[0].length;
        const sig = t.slice(start, t.indexOf('{\n', start) > 0 ? t.indexOf('{\n', start) : start + 400);
        const ret = /\)\s*:\s*([^{]+)$/.exec(sig.trim())?.[1] ?? '';
        for (const key of [`${areaOf[fi]}/${name}`, name]) {
          const prev = fnDocs.get(key);
          fnDocs.set(key, { doc: (prev?.doc ?? '') + doc, returns: ret });
        }
      }
    }
  }
  docCache = new Map();
  for (const [name, { doc }] of fnDocs) if (/@internal\b/.test(doc)) internalNames.add(name);
  for (const [name, { doc, returns }] of fnDocs) {
    let all = doc;
    for (const id of returns.match(/[A-Z][A-Za-z0-9_]+/g) ?? []) all += typeDocs.get(id) ?? '';
    docCache.set(name, all);
  }
  return docCache;
}

/** Whether an export's documentation (or its result type's) says that results may hold NaN or infinities. */
export function documentsNonFinite(name: string, area?: string): boolean {
  const d = (area && docs().get(`${area}/${name}`)) || docs().get(name) || '';
  return /\bNaN\b|Infinity|non-finite|infinite/.test(d);
}
