/**
 * Aperture arrays: pinholes or lenslets on a square or hexagonal lattice, in the mask
 * plane of the sensor frame (x, y in metres; the array's bounding box is centred on the
 * origin).
 *
 * Lattice indices are *axial*: aperture `(i, j)` sits at `origin + i·a1 + j·a2`. On a
 * square lattice `a1 = pitch·(1, 0)`, `a2 = pitch·(0, 1)`; on a hexagonal lattice
 * `a2 = pitch·(1/2, √3/2)`, and the rectangular block of `columns × rows` apertures uses
 * column `c = i + ⌊j/2⌋`, so that rows are staggered by half a pitch. Both vectors are
 * then turned by `rotation` about the sensor's z axis.
 *
 * @module
 */
import { checkInteger, checkOptions, checkOneOf, checkPositive, checkFinite, checkAllocation, rangeError, typeError } from '../core/index.js';

/** The two lattices an aperture array can use. */
export type LatticeKind = 'square' | 'hexagonal';

/** What {@link createApertureArray} needs. */
export interface ApertureArraySpec {
  /** Lattice type. @defaultValue `'square'` */
  lattice?: LatticeKind;
  /** Distance between neighbouring apertures, metres (> 0). */
  pitch: number;
  /** Apertures per row (≥ 1). */
  columns: number;
  /** Rows (≥ 1). */
  rows: number;
  /** Diameter of each pinhole or lenslet, metres (> 0, at most the pitch). */
  apertureDiameter: number;
  /** Turn of the lattice about the sensor's z axis, radians, counter-clockwise. @defaultValue 0 */
  rotation?: number;
  /** Focal length of lenslets, metres; absent (or `null`) for pinholes. @defaultValue null */
  focalLength?: number | null;
}

/** An aperture array in the sensor frame. Create one with {@link createApertureArray}. */
export interface ApertureArray {
  /** Lattice type. */
  readonly lattice: LatticeKind;
  /** Lattice pitch, metres. */
  readonly pitch: number;
  /** Apertures per row. */
  readonly columns: number;
  /** Rows. */
  readonly rows: number;
  /** Aperture diameter, metres. */
  readonly apertureDiameter: number;
  /** Lattice rotation, radians. */
  readonly rotation: number;
  /** Lenslet focal length, metres, or `null` for pinholes. */
  readonly focalLength: number | null;
  /** Number of apertures, `columns × rows`. */
  readonly count: number;
  /** Aperture centres in the mask plane, packed `x y x y …`, metres, sensor frame. */
  readonly positions: Float64Array;
  /** Axial lattice indices, packed `i j i j …`. */
  readonly indices: Int32Array;
  /** Lattice vectors `[a1x, a1y, a2x, a2y]`, metres, sensor frame. */
  readonly basis: readonly [number, number, number, number];
  /** Position of axial index `(0, 0)`, metres, sensor frame. */
  readonly origin: readonly [number, number];
}

/** Axial neighbour offsets of the square lattice (4-neighbourhood). */
export const SQUARE_NEIGHBOURS: readonly (readonly [number, number])[] = [
  [1, 0],
  [-1, 0],
  [0, 1],
  [0, -1],
];

/** Axial neighbour offsets of the hexagonal lattice (6-neighbourhood). */
export const HEXAGONAL_NEIGHBOURS: readonly (readonly [number, number])[] = [
  [1, 0],
  [-1, 0],
  [0, 1],
  [0, -1],
  [1, -1],
  [-1, 1],
];

/**
 * Build an aperture array.
 *
 * @param spec - Lattice, pitch, size, aperture diameter, rotation, lenslet focal length.
 * @returns The array, centred on the sensor origin.
 * @throws {@link core!MeniscusRangeError} for a non-positive pitch or diameter, a diameter
 *   above the pitch, non-integer or non-positive counts, a non-finite rotation or a
 *   non-positive focal length.
 * @see Platt, B. C. & Shack, R. (2001), "History and principles of Shack–Hartmann
 *   wavefront sensing", Journal of Refractive Surgery 17, S573–S577 (lenslet arrays).
 * @example
 * ```ts
 * const arr = createApertureArray({ lattice: 'hexagonal', pitch: 0.01, columns: 16, rows: 16, apertureDiameter: 0.001 });
 * arr.count; // 256
 * ```
 */
export function createApertureArray(spec: ApertureArraySpec): ApertureArray {
  const fn = 'createApertureArray';
  if (spec === undefined) typeError(fn, 'spec', spec, 'an aperture-array spec object');
  checkOptions(fn, spec, 'spec');
  const lattice = spec.lattice === undefined ? 'square' : checkOneOf(fn, 'spec.lattice', spec.lattice, ['square', 'hexagonal'] as const);
  const pitch = checkPositive(fn, 'spec.pitch', spec.pitch);
  const columns = checkInteger(fn, 'spec.columns', spec.columns, 1, 65536);
  const rows = checkInteger(fn, 'spec.rows', spec.rows, 1, 65536);
  checkAllocation(fn, 'spec.columns × spec.rows', columns * rows);
  const apertureDiameter = checkPositive(fn, 'spec.apertureDiameter', spec.apertureDiameter);
  if (!(apertureDiameter <= pitch)) rangeError(fn, 'spec.apertureDiameter', apertureDiameter, `at most the pitch (${pitch} m)`);
  const rotation = spec.rotation === undefined ? 0 : checkFinite(fn, 'spec.rotation', spec.rotation);
  const focalLength = spec.focalLength === undefined || spec.focalLength === null ? null : checkPositive(fn, 'spec.focalLength', spec.focalLength);
  const c = Math.cos(rotation);
  const s = Math.sin(rotation);
  // Unrotated lattice vectors.
  const b1x = pitch, b1y = 0;
  const b2x = lattice === 'square' ? 0 : pitch / 2;
  const b2y = lattice === 'square' ? pitch : (pitch * Math.sqrt(3)) / 2;
  const count = columns * rows;
  const positions = new Float64Array(2 * count);
  const indices = new Int32Array(2 * count);
  // Unrotated positions of index (0,0)-relative offsets; find the bounding box centre.
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (let j = 0; j < rows; j++) {
    const shift = lattice === 'square' ? 0 : Math.floor(j / 2);
    for (let col = 0; col < columns; col++) {
      const i = col - shift;
      const x = i * b1x + j * b2x;
      const y = i * b1y + j * b2y;
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
  }
  const ox = -(minX + maxX) / 2;
  const oy = -(minY + maxY) / 2;
  let k = 0;
  for (let j = 0; j < rows; j++) {
    const shift = lattice === 'square' ? 0 : Math.floor(j / 2);
    for (let col = 0; col < columns; col++, k++) {
      const i = col - shift;
      const x = ox + i * b1x + j * b2x;
      const y = oy + i * b1y + j * b2y;
      positions[2 * k] = c * x - s * y;
      positions[2 * k + 1] = s * x + c * y;
      indices[2 * k] = i;
      indices[2 * k + 1] = j;
    }
  }
  return {
    lattice,
    pitch,
    columns,
    rows,
    apertureDiameter,
    rotation,
    focalLength,
    count,
    positions,
    indices,
    basis: [c * b1x - s * b1y, s * b1x + c * b1y, c * b2x - s * b2y, s * b2x + c * b2y],
    origin: [c * ox - s * oy, s * ox + c * oy],
  };
}

/**
 * The aperture number of axial index `(i, j)`, or −1 when no aperture of the array has it.
 *
 * @param array - The aperture array.
 * @param i - Axial index along `a1`.
 * @param j - Axial index along `a2` (the row).
 * @returns The aperture number (row-major over rows and columns), or −1.
 * @example
 * ```ts
 * apertureAt(arr, 0, 0); // 0
 * ```
 */
export function apertureAt(array: ApertureArray, i: number, j: number): number {
  if (array === null || typeof array !== 'object' || typeof array.rows !== 'number' || typeof array.columns !== 'number') {
    typeError('apertureAt', 'array', array, 'an ApertureArray from createApertureArray');
  }
  if (typeof i !== 'number') typeError('apertureAt', 'i', i, 'a number');
  if (typeof j !== 'number') typeError('apertureAt', 'j', j, 'a number');
  if (!(j >= 0 && j < array.rows) || !Number.isInteger(i) || !Number.isInteger(j)) return -1;
  const col = array.lattice === 'square' ? i : i + Math.floor(j / 2);
  if (!(col >= 0 && col < array.columns)) return -1;
  return j * array.columns + col;
}

/**
 * The neighbour offsets of the array's lattice, in axial indices.
 *
 * @param array - The aperture array (or just its lattice kind).
 * @returns 4 offsets (square) or 6 (hexagonal); opposite offsets come in pairs `2k, 2k+1`.
 * @example
 * ```ts
 * latticeNeighbours(arr).length; // 4 or 6
 * ```
 */
export function latticeNeighbours(array: ApertureArray | LatticeKind): readonly (readonly [number, number])[] {
  const given = typeof array === 'string' || array === null || typeof array !== 'object' ? array : array.lattice;
  const kind = checkOneOf('latticeNeighbours', typeof array === 'string' ? 'array' : 'array.lattice', given, ['square', 'hexagonal'] as const);
  return kind === 'square' ? SQUARE_NEIGHBOURS : HEXAGONAL_NEIGHBOURS;
}
