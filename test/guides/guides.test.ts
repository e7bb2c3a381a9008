// Every guide's ```ts blocks are real programs: each is written to a temporary module
// with its `meniscus/…` imports pointed at the repository's sources, and imported. A
// block that throws fails its guide. Blocks marked ```ts no-run are skipped (none yet).
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it, vi } from 'vitest';

const ROOT = resolve(fileURLToPath(new URL('../..', import.meta.url)));
const GUIDES = join(ROOT, 'docs', 'guides');
const EXPECTED = [
  'getting-started',
  'frames-and-units',
  'designing-a-sensor',
  'tank-experiment',
  'field-use-with-the-sun',
  'choosing-an-integrator',
];

/** The ```ts blocks of a Markdown text, with the line each starts on. */
export function tsBlocks(markdown: string): { code: string; line: number }[] {
  const out: { code: string; line: number }[] = [];
  const lines = markdown.split('\n');
  for (let i = 0; i < lines.length; i++) {
    const m = /^```(\w+)(.*)$/.exec(lines[i]!);
    if (!m) continue;
    let j = i + 1;
    while (j < lines.length && !/^```\s*$/.test(lines[j]!)) j++;
    if (m[1] === 'ts' && !/no-run/.test(m[2]!)) out.push({ code: lines.slice(i + 1, j).join('\n'), line: i + 1 });
    i = j;
  }
  return out;
}

/** Point `meniscus` and `meniscus/<area>` imports at the sources. */
export function rewriteImports(code: string): string {
  return code.replace(/from\s+'meniscus(?:\/([a-z]+))?'/g, (_m, area: string | undefined) => {
    const target = area === undefined ? join(ROOT, 'src', 'index.ts') : join(ROOT, 'src', area, 'index.ts');
    return `from ${JSON.stringify(pathToFileURL(target).href)}`;
  });
}

const files = readdirSync(GUIDES).filter((f) => f.endsWith('.md')).sort();
const tmp = mkdtempSync(join(tmpdir(), 'meniscus-guides-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('guides', () => {
  it('has every guide, each with runnable code', () => {
    const names = files.map((f) => f.replace(/^\d+-/, '').replace(/\.md$/, ''));
    expect(names).toEqual(EXPECTED);
    for (const f of files) expect(tsBlocks(readFileSync(join(GUIDES, f), 'utf8')).length, f).toBeGreaterThan(0);
  });

  it('the import rewrite maps the root and every subpath', () => {
    expect(rewriteImports("import { refract } from 'meniscus/optics';")).toContain('/src/optics/index.ts');
    expect(rewriteImports("import { refract } from 'meniscus';")).toContain('/src/index.ts');
  });

  for (const f of files) {
    const blocks = tsBlocks(readFileSync(join(GUIDES, f), 'utf8'));
    blocks.forEach((b, k) => {
      it(`${f}: the block at line ${b.line} runs`, async () => {
        const file = join(tmp, `${f.replace(/\.md$/, '')}-${k}.ts`);
        writeFileSync(file, rewriteImports(b.code) + '\nexport {};\n');
        const log = vi.spyOn(console, 'log').mockImplementation(() => undefined);
        try {
          await import(pathToFileURL(file).href);
        } finally {
          log.mockRestore();
        }
      });
    });
  }
});
