/**
 * Finding the frames of a run: every image in a folder, or a numbered sequence given as
 * a pattern such as `cam/shot_%04d.png`.
 *
 * @module
 */
import { existsSync, readdirSync, statSync } from 'node:fs';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { UsageError } from './exit-codes.js';

/** One input image of a sequence. */
export interface SequenceItem {
  /** The file name without its extension: names the frame's output folder. */
  readonly stem: string;
  /** The file's absolute path. */
  readonly path: string;
  /** The frame number matched by a pattern, or the position in the folder listing. */
  readonly number: number;
}

/** The image types a sequence may hold. */
export const FRAME_EXTENSIONS: readonly string[] = ['.png', '.npy'];

const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });

/**
 * List a sequence of images.
 *
 * - a folder: every `.png` and `.npy` file in it, in natural order (`f2` before `f10`);
 * - a pattern with one `%d` or `%0Nd` (e.g. `frames/shot_%04d.png`): every file of its
 *   folder whose name matches, by number;
 * - a single file: that file.
 *
 * @param spec - Folder, pattern or file, relative to `cwd`.
 * @param cwd - The folder relative paths start from.
 * @param option - The option name, for messages.
 * @returns The images, in order.
 * @throws {@link UsageError} for a pattern with more than one number field or a sequence
 *   with no image; a file-system error (`ENOENT`) for a folder that does not exist.
 * @example
 * ```ts
 * listSequence('sim/frames/frame_%04d.png', process.cwd(), 'frames');
 * ```
 */
export function listSequence(spec: string, cwd: string, option: string): SequenceItem[] {
  const full = resolve(cwd, spec);
  const fields = spec.match(/%0?\d*d/g) ?? [];
  let items: SequenceItem[];
  if (fields.length > 1) throw new UsageError(`--${option} pattern ${JSON.stringify(spec)} has ${fields.length} number fields; use one (%d or %04d)`, 'process');
  if (fields.length === 1) {
    const dir = dirname(full);
    const name = basename(full);
    const [pre, post] = name.split(/%0?\d*d/) as [string, string];
    const esc = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    const m = /%0?(\d*)d/.exec(name)!;
    const digits = m[1] ? `\\d{${Number(m[1])},}` : '\\d+';
    const re = new RegExp(`^${esc(pre)}(${digits})${esc(post)}$`);
    items = [];
    for (const f of readdirSync(dir)) {
      const mm = re.exec(f);
      if (mm) items.push({ stem: basename(f, extname(f)), path: join(dir, f), number: Number(mm[1]) });
    }
    items.sort((a, b) => a.number - b.number);
  } else if (existsSync(full) && statSync(full).isDirectory()) {
    const files = readdirSync(full).filter((f) => FRAME_EXTENSIONS.includes(extname(f).toLowerCase()) && statSync(join(full, f)).isFile());
    files.sort(collator.compare);
    items = files.map((f, k) => ({ stem: basename(f, extname(f)), path: join(full, f), number: k }));
  } else {
    statSync(full); // throws ENOENT for a missing path
    items = [{ stem: basename(full, extname(full)), path: full, number: 0 }];
  }
  if (items.length === 0) throw new UsageError(`--${option} ${JSON.stringify(spec)} holds no .png or .npy image`, 'process');
  const seen = new Set<string>();
  for (const it of items) {
    if (seen.has(it.stem)) throw new UsageError(`--${option}: two images share the name ${JSON.stringify(it.stem)} (e.g. a .png and a .npy); keep one`, 'process');
    seen.add(it.stem);
  }
  return items;
}
