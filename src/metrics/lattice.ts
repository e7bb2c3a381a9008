/**
 * Scores of a lattice of checkerboard corners: the spread of the square sizes, the
 * straightness of the grid lines and the displacement against known true corners.
 *
 * @module
 */
import { LIMITS, checkFloat64Array, checkInteger, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';

/**
 * Corners of a checkerboard indexed by column and row, in image pixels (pixel centres at
 * integer coordinates, origin at the centre of the top-left pixel, y down).
 *
 * Corner `(i, j)` (column `i`, row `j`) is at `points[2·(j·columns + i)]`,
 * `points[2·(j·columns + i) + 1]`; `found[j·columns + i]` is `1` where the corner is
 * known. Where `found` is `0` the point holds `NaN` (a {@link detectCheckerboardCorners}
 * result) or anything (a user's lattice): scores never read it.
 */
export interface CornerLattice {
  /** Corners along a row (number of columns of the lattice). */
  readonly columns: number;
  /** Corners along a column (number of rows of the lattice). */
  readonly rows: number;
  /** `2 × columns × rows` coordinates, pixels, packed `x y x y …`, row-major. */
  readonly points: Float64Array;
  /** `columns × rows` flags, `1` = corner known. */
  readonly found: Uint8Array;
}

/**
 * Build and validate a corner lattice from packed points (for example the true corners
 * of a rendered board, or corners found by another tool).
 *
 * @param columns - Corners along a row (≥ 1).
 * @param rows - Corners along a column (≥ 1).
 * @param points - `2 × columns × rows` coordinates, pixels (copied).
 * @param found - Optional flags, `1` = known (copied). @defaultValue every corner known
 * @returns The lattice.
 * @throws {@link core!MeniscusTypeError} for arrays of the wrong type or length.
 * @throws {@link core!MeniscusRangeError} for bad sizes, flags other than 0/1, or a non-finite known point.
 * @example
 * ```ts
 * const truth = createCornerLattice(2, 1, new Float64Array([10, 20, 40, 20]));
 * ```
 */
export function createCornerLattice(columns: number, rows: number, points: Float64Array, found?: Uint8Array): CornerLattice {
  const fn = 'createCornerLattice';
  checkInteger(fn, 'columns', columns, 1, LIMITS.maxSide);
  checkInteger(fn, 'rows', rows, 1, LIMITS.maxSide);
  const n = columns * rows;
  if (!(n <= LIMITS.maxBatch)) rangeError(fn, 'columns × rows', n, `at most ${LIMITS.maxBatch} corners`);
  checkFloat64Array(fn, 'points', points, 2, 2 * n);
  let f: Uint8Array;
  if (found === undefined) f = new Uint8Array(n).fill(1);
  else {
    if (!(found instanceof Uint8Array) || found.length !== n) typeError(fn, 'found', found, `a Uint8Array of length ${n}`);
    f = found.slice();
  }
  for (let k = 0; k < n; k++) {
    const v = f[k]!;
    if (v !== 0 && v !== 1) rangeError(fn, `found[${k}]`, v, '0 (missing) or 1 (known)');
    if (v === 1 && !(Number.isFinite(points[2 * k]!) && Number.isFinite(points[2 * k + 1]!))) {
      rangeError(fn, `points[${2 * k}..${2 * k + 1}]`, [points[2 * k], points[2 * k + 1]], 'finite coordinates where the corner is known');
    }
  }
  return { columns, rows, points: points.slice(), found: f };
}

/** Validate a lattice given by a user (shape and known points). */
function checkLattice(fn: string, parameter: string, value: unknown): CornerLattice {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, 'a CornerLattice {columns, rows, points, found}');
  const l = value as Partial<CornerLattice>;
  checkInteger(fn, `${parameter}.columns`, l.columns, 0, LIMITS.maxSide);
  checkInteger(fn, `${parameter}.rows`, l.rows, 0, LIMITS.maxSide);
  const n = l.columns! * l.rows!;
  checkFloat64Array(fn, `${parameter}.points`, l.points, 2, 2 * n);
  if (!(l.found instanceof Uint8Array) || l.found.length !== n) {
    typeError(fn, `${parameter}.found`, l.found, `a Uint8Array of length ${n}`);
  }
  const p = l.points!;
  for (let k = 0; k < n; k++) {
    if (l.found[k] === 1 && !(Number.isFinite(p[2 * k]!) && Number.isFinite(p[2 * k + 1]!))) {
      rangeError(fn, `${parameter}.points[${2 * k}]`, p[2 * k], 'finite coordinates where the corner is found');
    }
  }
  return l as CornerLattice;
}

/** Statistics of one family of square sides. */
export interface SideStatistics {
  /** Number of sides measured (pairs of adjacent known corners). */
  readonly count: number;
  /** Mean side length, pixels (0 when `count` is 0). */
  readonly mean: number;
  /** Standard deviation of the side lengths (population, divisor `count`), pixels. */
  readonly std: number;
  /** `std / mean`, unitless (0 when `count` is 0). */
  readonly relativeStd: number;
  /** Shortest side, pixels (0 when `count` is 0). */
  readonly min: number;
  /** Longest side, pixels (0 when `count` is 0). */
  readonly max: number;
  /** With a known size: `mean / knownSize − 1`; otherwise `undefined`. */
  readonly meanRelativeError: number | undefined;
  /** With a known size: `std / knownSize`; otherwise `undefined`. */
  readonly stdRelativeToKnown: number | undefined;
  /** With a known size: RMS of `side / knownSize − 1`; otherwise `undefined`. */
  readonly rmsRelativeError: number | undefined;
}

/** The result of {@link squareSizeSpread}. */
export interface SquareSizeSpread {
  /** Sides along the rows: distances from corner `(i, j)` to `(i + 1, j)`. */
  readonly alongRows: SideStatistics;
  /** Sides along the columns: distances from corner `(i, j)` to `(i, j + 1)`. */
  readonly alongColumns: SideStatistics;
  /** Both families pooled. */
  readonly all: SideStatistics;
}

/** Options of {@link squareSizeSpread}. */
export interface SquareSizeOptions {
  /** The side length the squares should have in the image, pixels (> 0), for the relative figures. */
  knownSize?: number;
}

/**
 * Spread of the checkerboard's square sizes in the image: the lengths of the sides
 * between adjacent known corners along both lattice axes, with their mean, standard
 * deviation and, when the true size is known, the relative errors.
 *
 * Through flat water (or no water) and a fronto-parallel camera every side has the same
 * length and the spread is zero; a wavy surface magnifies some squares and shrinks
 * others, so the spread measures how much of that distortion is left.
 *
 * @param lattice - Corners, e.g. from {@link detectCheckerboardCorners}.
 * @param options - The known size.
 * @returns Statistics along rows, along columns and pooled.
 * @throws {@link core!MeniscusTypeError} for a malformed lattice.
 * @throws {@link core!MeniscusRangeError} for a non-finite known corner or a `knownSize` that is not > 0.
 * @see Common practice in refraction-correction evaluation with a printed target.
 * @example
 * ```ts
 * const s = squareSizeSpread(detectCheckerboardCorners(img), { knownSize: 24 });
 * s.all.relativeStd; // 0 for a perfect board
 * ```
 */
export function squareSizeSpread(lattice: CornerLattice, options?: SquareSizeOptions): SquareSizeSpread {
  const fn = 'squareSizeSpread';
  const o = checkOptions(fn, options);
  checkLattice(fn, 'lattice', lattice);
  const known = o.knownSize === undefined ? undefined : checkPositive(fn, 'options.knownSize', o.knownSize);
  const { columns, rows, points: p, found } = lattice;
  const rowSides: number[] = [];
  const colSides: number[] = [];
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const k = j * columns + i;
      if (found[k] !== 1) continue;
      if (i + 1 < columns && found[k + 1] === 1) {
        rowSides.push(Math.hypot(p[2 * k + 2]! - p[2 * k]!, p[2 * k + 3]! - p[2 * k + 1]!));
      }
      if (j + 1 < rows && found[k + columns] === 1) {
        const m = k + columns;
        colSides.push(Math.hypot(p[2 * m]! - p[2 * k]!, p[2 * m + 1]! - p[2 * k + 1]!));
      }
    }
  }
  return {
    alongRows: sideStats(rowSides, known),
    alongColumns: sideStats(colSides, known),
    all: sideStats(rowSides.concat(colSides), known),
  };
}

function sideStats(s: readonly number[], known: number | undefined): SideStatistics {
  const n = s.length;
  if (n === 0) {
    return {
      count: 0,
      mean: 0,
      std: 0,
      relativeStd: 0,
      min: 0,
      max: 0,
      meanRelativeError: known === undefined ? undefined : 0,
      stdRelativeToKnown: known === undefined ? undefined : 0,
      rmsRelativeError: known === undefined ? undefined : 0,
    };
  }
  let sum = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of s) {
    sum += v;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const mean = sum / n;
  let ss = 0;
  for (const v of s) ss += (v - mean) ** 2;
  const std = Math.sqrt(ss / n);
  let rmsRel: number | undefined;
  if (known !== undefined) {
    let sr = 0;
    for (const v of s) sr += (v / known - 1) ** 2;
    rmsRel = Math.sqrt(sr / n);
  }
  return {
    count: n,
    mean,
    std,
    relativeStd: std / mean,
    min: lo,
    max: hi,
    meanRelativeError: known === undefined ? undefined : mean / known - 1,
    stdRelativeToKnown: known === undefined ? undefined : std / known,
    rmsRelativeError: rmsRel,
  };
}

/** The fit of one lattice line (a row or a column of corners). */
export interface LineFit {
  /** The row index `j` (for a row) or column index `i` (for a column). */
  readonly index: number;
  /** Known corners on the line. */
  readonly count: number;
  /** RMS perpendicular distance of the corners from their total-least-squares line, pixels. */
  readonly rmsDistance: number;
  /** Largest perpendicular distance from that line, pixels. */
  readonly maxDistance: number;
  /**
   * Curvature `2γ` of the quadratic `d = α + β s + γ s²` fitted to the perpendicular
   * offsets `d` against the position `s` along the line, 1/pixel; signed, positive when
   * the line bows towards the normal `(−t_y, t_x)` at its ends, where `t` is the line's
   * direction of increasing index (so positive means ends bent down for a row and ends
   * bent left for a column). 0 with fewer than 3 corners.
   */
  readonly curvature: number;
  /** Sagitta `|γ| ℓ² / 4` of that quadratic over the span `ℓ` of the corners, pixels. */
  readonly sagitta: number;
}

/** The result of {@link lineStraightness}. */
export interface LineStraightness {
  /** One fit a lattice row with at least 3 known corners. */
  readonly rows: readonly LineFit[];
  /** One fit a lattice column with at least 3 known corners. */
  readonly columns: readonly LineFit[];
  /** RMS perpendicular distance pooled over every corner of every fitted line, pixels (0 when none). */
  readonly rmsDistance: number;
  /** Largest perpendicular distance of any corner from its line, pixels. */
  readonly maxDistance: number;
  /** Mean of `|curvature|` over the fitted lines, 1/pixel. */
  readonly meanAbsCurvature: number;
  /** Largest `|curvature|`, 1/pixel. */
  readonly maxAbsCurvature: number;
  /** Mean sagitta over the fitted lines, pixels. */
  readonly meanSagitta: number;
  /** Largest sagitta, pixels. */
  readonly maxSagitta: number;
}

/**
 * Straightness of the grid lines of a corner lattice: for each row and column with at
 * least three known corners, the RMS perpendicular distance of its corners from their
 * total-least-squares line, and the curvature and sagitta of a quadratic fitted to the
 * offsets along that line.
 *
 * The lines of a printed board are straight; a camera without lens distortion keeps
 * them straight through flat water, so what bends them is the surface (or uncorrected
 * lens distortion).
 *
 * @param lattice - Corners, e.g. from {@link detectCheckerboardCorners}.
 * @returns Per-line fits and pooled figures.
 * @throws {@link core!MeniscusTypeError} for a malformed lattice.
 * @throws {@link core!MeniscusRangeError} for a non-finite known corner.
 * @see Pearson (1901), "On lines and planes of closest fit to systems of points in
 *   space", Philosophical Magazine 2(11), 559 (total least squares line); straightness
 *   of imaged lines as a distortion score is common practice (e.g. Devernay & Faugeras
 *   2001, "Straight lines have to be straight", Machine Vision and Applications 13, 14).
 * @example
 * ```ts
 * const s = lineStraightness(detectCheckerboardCorners(img));
 * s.rmsDistance; // ≈ 0 for straight lines
 * ```
 */
export function lineStraightness(lattice: CornerLattice): LineStraightness {
  const fn = 'lineStraightness';
  checkLattice(fn, 'lattice', lattice);
  const { columns, rows, points: p, found } = lattice;
  const xs = new Float64Array(Math.max(columns, rows));
  const ys = new Float64Array(Math.max(columns, rows));
  const rowFits: LineFit[] = [];
  const colFits: LineFit[] = [];
  let ss = 0;
  let total = 0;
  let maxD = 0;
  // Each lattice line (a row starts at j·columns and steps by 1; a column starts at i and
  // steps by columns) with at least three corners found gets its fitted line.
  const fitLines = (lines: number, length: number, lineStride: number, step: number, into: LineFit[]): void => {
    for (let a = 0; a < lines; a++) {
      let m = 0;
      for (let b = 0, k = a * lineStride; b < length; b++, k += step) {
        if (found[k] !== 1) continue;
        xs[m] = p[2 * k]!;
        ys[m] = p[2 * k + 1]!;
        m++;
      }
      if (m < 3) continue;
      const f = fitLine(xs, ys, m, a);
      into.push(f.fit);
      ss += f.ss;
      total += m;
      if (f.fit.maxDistance > maxD) maxD = f.fit.maxDistance;
    }
  };
  fitLines(rows, columns, columns, 1, rowFits);
  fitLines(columns, rows, 1, columns, colFits);
  const all = rowFits.concat(colFits);
  let sc = 0;
  let mc = 0;
  let sg = 0;
  let mg = 0;
  for (const f of all) {
    const c = Math.abs(f.curvature);
    sc += c;
    if (c > mc) mc = c;
    sg += f.sagitta;
    if (f.sagitta > mg) mg = f.sagitta;
  }
  const nl = all.length;
  return {
    rows: rowFits,
    columns: colFits,
    rmsDistance: total === 0 ? 0 : Math.sqrt(ss / total),
    maxDistance: maxD,
    meanAbsCurvature: nl === 0 ? 0 : sc / nl,
    maxAbsCurvature: mc,
    meanSagitta: nl === 0 ? 0 : sg / nl,
    maxSagitta: mg,
  };
}

/** Total-least-squares line and quadratic offsets of `m` ordered points. */
function fitLine(xs: Float64Array, ys: Float64Array, m: number, index: number): { fit: LineFit; ss: number } {
  let cx = 0;
  let cy = 0;
  for (let k = 0; k < m; k++) {
    cx += xs[k]!;
    cy += ys[k]!;
  }
  cx /= m;
  cy /= m;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let k = 0; k < m; k++) {
    const dx = xs[k]! - cx;
    const dy = ys[k]! - cy;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  // Principal direction of the 2×2 scatter matrix.
  const theta = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  let tx = Math.cos(theta);
  let ty = Math.sin(theta);
  // Orient along increasing index (first to last point).
  if (tx * (xs[m - 1]! - xs[0]!) + ty * (ys[m - 1]! - ys[0]!) < 0) {
    tx = -tx;
    ty = -ty;
  }
  const nx = -ty;
  const ny = tx;
  // Quadratic d = α + β s + γ s² by normal equations (s centred, so well conditioned).
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let s4 = 0;
  let d0 = 0;
  let d1 = 0;
  let d2 = 0;
  let ss = 0;
  let maxD = 0;
  let smin = Infinity;
  let smax = -Infinity;
  for (let k = 0; k < m; k++) {
    const dx = xs[k]! - cx;
    const dy = ys[k]! - cy;
    const s = tx * dx + ty * dy;
    const d = nx * dx + ny * dy;
    ss += d * d;
    if (Math.abs(d) > maxD) maxD = Math.abs(d);
    if (s < smin) smin = s;
    if (s > smax) smax = s;
    const sq = s * s;
    s0 += 1;
    s1 += s;
    s2 += sq;
    s3 += sq * s;
    s4 += sq * sq;
    d0 += d;
    d1 += d * s;
    d2 += d * sq;
  }
  const gamma = solve3Gamma(s0, s1, s2, s3, s4, d0, d1, d2);
  const span = smax - smin;
  return {
    fit: {
      index,
      count: m,
      rmsDistance: Math.sqrt(ss / m),
      maxDistance: maxD,
      curvature: 2 * gamma,
      sagitta: (Math.abs(gamma) * span * span) / 4,
    },
    ss,
  };
}

/** γ of the 3×3 system [[s0 s1 s2][s1 s2 s3][s2 s3 s4]]·[α β γ] = [d0 d1 d2] (Cramer). */
function solve3Gamma(s0: number, s1: number, s2: number, s3: number, s4: number, d0: number, d1: number, d2: number): number {
  const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (!(Math.abs(det) > 1e-300)) return 0;
  const detG = s0 * (s2 * d2 - d1 * s3) - s1 * (s1 * d2 - d1 * s2) + d0 * (s1 * s3 - s2 * s2);
  return detG / det;
}

/** Options of {@link cornerDisplacement}. */
export interface CornerDisplacementOptions {
  /**
   * When the truth is a packed point list: the largest distance at which a detected
   * corner is paired with its nearest true corner, pixels.
   * @defaultValue half the median side between adjacent detected corners (no limit when none)
   */
  maxDistance?: number;
}

/** The result of {@link cornerDisplacement}. */
export interface CornerDisplacement {
  /** RMS distance between paired corners, pixels (0 when none are paired). */
  readonly rms: number;
  /** Mean distance, pixels. */
  readonly mean: number;
  /** Largest distance, pixels. */
  readonly max: number;
  /** Number of pairs scored. */
  readonly count: number;
  /** Known detected corners without a true partner (no known true corner at the same index, or none within `maxDistance`). */
  readonly unmatched: number;
}

/**
 * RMS displacement of detected corners from the true ones.
 *
 * With the truth as a {@link CornerLattice} of the same columns and rows, corners are
 * paired by index (this also checks the indexing). With the truth as packed points
 * (`x y x y …`), each known detected corner is paired with its nearest true corner
 * within `maxDistance`.
 *
 * @param detected - The detected corners.
 * @param truth - The true corners, as a lattice of the same shape or a packed `Float64Array`.
 * @param options - Pairing distance.
 * @returns RMS, mean and largest distance, pairs and unpaired corners.
 * @throws {@link core!MeniscusTypeError} for a malformed lattice, a truth lattice of another shape, or a packed array of odd length.
 * @throws {@link core!MeniscusRangeError} for non-finite points or a `maxDistance` that is not > 0.
 * @see Common practice: root-mean-square reprojection-style point error.
 * @example
 * ```ts
 * const d = cornerDisplacement(detectCheckerboardCorners(img), truthLattice);
 * d.rms; // pixels
 * ```
 */
export function cornerDisplacement(
  detected: CornerLattice,
  truth: CornerLattice | Float64Array,
  options?: CornerDisplacementOptions,
): CornerDisplacement {
  const fn = 'cornerDisplacement';
  const o = checkOptions(fn, options);
  checkLattice(fn, 'detected', detected);
  const maxDist = o.maxDistance === undefined ? undefined : checkPositive(fn, 'options.maxDistance', o.maxDistance);
  const { columns, rows, points: p, found } = detected;
  const n = columns * rows;
  let ss = 0;
  let sum = 0;
  let mx = 0;
  let count = 0;
  let unmatched = 0;
  const add = (d: number): void => {
    ss += d * d;
    sum += d;
    if (d > mx) mx = d;
    count++;
  };
  if (truth instanceof Float64Array) {
    checkFloat64Array(fn, 'truth', truth, 2);
    for (let k = 0; k < truth.length; k++) {
      if (!Number.isFinite(truth[k]!)) rangeError(fn, `truth[${k}]`, truth[k], 'a finite coordinate');
    }
    let limit = maxDist;
    if (limit === undefined) {
      const med = medianSide(detected);
      limit = med > 0 ? med / 2 : Infinity;
    }
    const m = truth.length / 2;
    for (let k = 0; k < n; k++) {
      if (found[k] !== 1) continue;
      const x = p[2 * k]!;
      const y = p[2 * k + 1]!;
      let best = Infinity;
      for (let t = 0; t < m; t++) {
        const d2 = (truth[2 * t]! - x) ** 2 + (truth[2 * t + 1]! - y) ** 2;
        if (d2 < best) best = d2;
      }
      const d = Math.sqrt(best);
      if (d <= limit) add(d);
      else unmatched++;
    }
  } else {
    checkLattice(fn, 'truth', truth);
    if (truth.columns !== columns || truth.rows !== rows) {
      typeError(fn, 'truth', `${truth.columns}×${truth.rows}`, `a lattice of ${columns}×${rows} corners (as detected), or packed points`);
    }
    const tp = truth.points;
    for (let k = 0; k < n; k++) {
      if (found[k] !== 1) continue;
      if (truth.found[k] !== 1) {
        unmatched++;
        continue;
      }
      const d = Math.hypot(p[2 * k]! - tp[2 * k]!, p[2 * k + 1]! - tp[2 * k + 1]!);
      if (maxDist !== undefined && d > maxDist) unmatched++;
      else add(d);
    }
  }
  return { rms: count === 0 ? 0 : Math.sqrt(ss / count), mean: count === 0 ? 0 : sum / count, max: mx, count, unmatched };
}

function medianSide(l: CornerLattice): number {
  const v: number[] = [];
  const { columns, rows, points: p, found } = l;
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const k = j * columns + i;
      if (found[k] !== 1) continue;
      if (i + 1 < columns && found[k + 1] === 1) v.push(Math.hypot(p[2 * k + 2]! - p[2 * k]!, p[2 * k + 3]! - p[2 * k + 1]!));
      if (j + 1 < rows && found[k + columns] === 1) {
        const m = k + columns;
        v.push(Math.hypot(p[2 * m]! - p[2 * k]!, p[2 * m + 1]! - p[2 * k + 1]!));
      }
    }
  }
  if (v.length === 0) return 0;
  v.sort((a, b) => a - b);
  return v[v.length >> 1]!;
}
