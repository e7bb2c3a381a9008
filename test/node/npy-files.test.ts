import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError, createGrid, createImage, gridFromFunction } from '../../src/core/index.js';
import {
  crc32,
  decodeNpz,
  encodeNpy,
  encodeNpz,
  gridToNpy,
  imageToNpy,
  maskToNpy,
  npyToGrid,
  npyToImage,
  npyToMask,
  readFrameResult,
  readNpy,
  readNpz,
  writeFrameResult,
  writeNpy,
  writeNpz,
} from '../../src/node/index.js';

const FIX = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'npy');
const dir = mkdtempSync(join(tmpdir(), 'meniscus-npy-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('readNpy / writeNpy (files in a temp dir)', () => {
  it('round trip through a file, and readNpy reads numpy-written files', () => {
    const p = join(dir, 'a.npy');
    const data = new Float32Array([1.5, -2, 3.25, 4]);
    const n = writeNpy(p, { shape: [2, 2], data }, { byteOrder: 'big' });
    expect(n).toBe(readFileSync(p).length);
    const back = readNpy(p);
    expect(Array.from(back.data)).toEqual([1.5, -2, 3.25, 4]);
    expect(back.byteOrder).toBe('big');
    const fx = readNpy(join(FIX, 'f8_le_c_2x3.npy'));
    expect(fx.shape).toEqual([2, 3]);
  });
  it('a truncated file and a file with a huge shape give clear errors', () => {
    const p = join(dir, 't.npy');
    const b = encodeNpy({ shape: [100], data: new Float64Array(100) });
    writeFileSync(p, b.subarray(0, b.length - 1));
    expect(() => readNpy(p)).toThrow(/truncated/);
    const h = Buffer.from("{'descr': '<f8', 'fortran_order': False, 'shape': (65536, 65536), }\n", 'latin1');
    const f = Buffer.concat([Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, h.length, 0]), h]);
    writeFileSync(p, f);
    expect(() => readNpy(p)).toThrow(MeniscusRangeError);
    writeFileSync(p, Buffer.from([1, 2, 3]));
    expect(() => readNpy(p)).toThrow(/truncated|at least 10 bytes/);
  });
});

describe('grid, mask and image conversions', () => {
  const g = gridFromFunction({ width: 4, height: 3, dx: 0.01, x0: -0.02 }, (x, y) => x * 10 + y * 100);
  it('grid → (height, width) C-order array and back, geometry from the caller', () => {
    const a = gridToNpy(g);
    expect(a.shape).toEqual([3, 4]);
    const back = npyToGrid({ ...a, dtype: 'float64', fortranOrder: false }, { dx: 0.01, x0: -0.02 });
    expect(Array.from(back.data)).toEqual(Array.from(g.data));
    expect(back.dx).toBe(0.01);
    expect(back.x0).toBe(-0.02);
  });
  it('npyToGrid reads a Fortran-order numpy fixture with a[j, i] = sample (i, j)', () => {
    const a = readNpy(join(FIX, 'f8_le_f_3x4.npy')); // values (k - 7) * 0.1 by C index k = j * 4 + i
    const grid = npyToGrid(a);
    expect(grid.width).toBe(4);
    expect(grid.height).toBe(3);
    for (let k = 0; k < 12; k++) expect(grid.data[k]).toBe((k - 7) * 0.1);
  });
  it('float32 storage rounds to float32', () => {
    const a = gridToNpy(createGrid({ width: 1, height: 1 }, new Float64Array([0.1])), { dtype: 'float32' });
    expect(a.data[0]).toBe(Math.fround(0.1));
  });
  it('mask ↔ array, as uint8 or bool; values other than 0/1 are refused', () => {
    const m = new Uint8Array([1, 0, 1, 1, 0, 1]);
    const a = maskToNpy(m, 3, 2, { dtype: 'bool' });
    const back = npyToMask(readNpy(writeAndPath('m.npy', a)));
    expect(Array.from(back.mask)).toEqual(Array.from(m));
    expect([back.width, back.height]).toEqual([3, 2]);
    expect(() => npyToMask({ dtype: 'uint8', shape: [1, 2], fortranOrder: false, data: new Uint8Array([0, 2]) })).toThrow(MeniscusRangeError);
    expect(() => npyToMask({ dtype: 'float64', shape: [1, 1], fortranOrder: false, data: new Float64Array(1) })).toThrow(MeniscusTypeError);
    expect(() => maskToNpy(new Uint8Array(5), 3, 2)).toThrow(MeniscusTypeError);
  });
  it('image ↔ array: (h, w, 3) numpy fixture of uint8 scaled by 1/255', () => {
    const img = npyToImage(readNpy(join(FIX, 'u1_c_4x5x3_image.npy')));
    expect([img.width, img.height, img.channels]).toEqual([5, 4, 3]);
    for (let k = 0; k < 60; k++) expect(img.data[k]).toBe(Math.fround(((k * 37 + 11) % 256) / 255));
    const q = imageToNpy(img, { dtype: 'uint8' });
    expect(q.shape).toEqual([4, 5, 3]);
    for (let k = 0; k < 60; k++) expect(q.data[k]).toBe((k * 37 + 11) % 256);
  });
  it('grey image is (h, w); uint16 quantisation clamps and rounds', () => {
    const img = createImage(2, 1, 1, new Float32Array([-0.5, 0.5]));
    const a = imageToNpy(img, { dtype: 'uint16' });
    expect(a.shape).toEqual([1, 2]);
    expect(Array.from(a.data)).toEqual([0, 32768]);
    expect(() => npyToImage({ dtype: 'int16', shape: [1, 1], fortranOrder: false, data: new Int16Array(1) })).toThrow(MeniscusTypeError);
    expect(() => npyToImage({ dtype: 'float32', shape: [1, 1, 5], fortranOrder: false, data: new Float32Array(5) })).toThrow(MeniscusRangeError);
  });
});

function writeAndPath(name: string, a: Parameters<typeof writeNpy>[1]): string {
  const p = join(dir, name);
  writeNpy(p, a);
  return p;
}

describe('npz archives', () => {
  it('crc32 check value of "123456789" is 0xCBF43926 (CRC-32/ISO-HDLC, Greg Cook\'s CRC catalogue; also zlib)', () => {
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
    expect(crc32(new Uint8Array(0))).toBe(0);
  });
  for (const f of ['frame_stored.npz', 'frame_deflated.npz']) {
    it(`reads numpy's own ${f} (numpy.savez / savez_compressed, ZIP64 local headers)`, () => {
      const a = readNpz(join(FIX, f));
      expect(Object.keys(a).sort()).toEqual(['height', 'mask']);
      expect(a.height!.shape).toEqual([3, 4]);
      for (let k = 0; k < 12; k++) expect(a.height!.data[k]).toBe((k - 7) * 0.1);
      for (let k = 0; k < 12; k++) expect(a.mask!.data[k]).toBe(((k * 37 + 11) % 256) % 2);
    });
  }
  it('members of our archives are byte-identical to numpy\'s .npy files', () => {
    const want = readFileSync(join(FIX, 'f8_le_c_2x3.npy'));
    const data = new Float64Array(6).map((_, k) => (k - 7) * 0.1);
    for (const compress of [false, true]) {
      const p = join(dir, `x${compress}.npz`);
      writeNpz(p, { h: { shape: [2, 3], data } }, { compress });
      const zip = readFileSync(p);
      // stored: the member bytes appear verbatim after the 30-byte header and "h.npy"
      if (!compress) expect(Buffer.from(zip.subarray(35, 35 + want.length)).equals(want)).toBe(true);
      const back = readNpz(p);
      expect(Array.from(back.h!.data)).toEqual(Array.from(data));
    }
  });
  it('is deterministic and refuses damaged archives and bad names', () => {
    const arrays = { a: { shape: [3], data: new Uint16Array([1, 2, 3]) } };
    const z1 = encodeNpz(arrays);
    expect(Buffer.from(z1).equals(Buffer.from(encodeNpz(arrays)))).toBe(true);
    const bad = z1.slice();
    bad[165] = bad[165]! ^ 0xff; // a data byte → CRC mismatch
    expect(() => decodeNpz(bad)).toThrow(/CRC-32/);
    expect(() => decodeNpz(z1.subarray(0, z1.length - 30))).toThrow(/ZIP archive/);
    expect(() => encodeNpz({ '../evil': arrays.a })).toThrow(MeniscusRangeError);
  });
});

describe('writeFrameResult / readFrameResult', () => {
  const spec = { width: 5, height: 4, dx: 0.002, dy: 0.003, x0: -0.004, y0: 0.01 };
  const height = gridFromFunction(spec, (x, y) => 1e-3 * Math.sin(300 * x) + y);
  const p = gridFromFunction(spec, (x) => 0.3 * Math.cos(300 * x));
  const q = gridFromFunction(spec, () => 1);
  const mask = new Uint8Array(20).fill(1);
  mask[3] = 0;
  it('writes one .npy per array and a meta.json index, and reads them back', () => {
    const out = join(dir, 'run', 'frame_0001');
    const index = writeFrameResult(out, {
      height,
      mask,
      slopeX: p,
      slopeY: q,
      grids: { residual: { grid: q, units: '1' } },
      meta: { frame: 1, timeMs: 1234 },
    });
    for (const f of ['height.npy', 'mask.npy', 'slope_x.npy', 'slope_y.npy', 'residual.npy', 'meta.json']) expect(existsSync(join(out, f))).toBe(true);
    expect(index.arrays.mask!.descr).toBe('|b1');
    expect(index.arrays.height!.descr).toBe('<f8');
    expect(index.grid).toEqual(spec);
    const r = readFrameResult(out);
    expect(Array.from(r.height.data)).toEqual(Array.from(height.data));
    expect(Array.from(r.mask!)).toEqual(Array.from(mask));
    expect(Array.from(r.slopeX!.data)).toEqual(Array.from(p.data));
    expect(r.grids.residual!.units).toBe('1');
    expect(r.meta).toEqual({ frame: 1, timeMs: 1234 });
    expect(r.height.dy).toBe(0.003);
  });
  it('refuses grids of another geometry, bad names and non-JSON metadata', () => {
    const other = createGrid({ ...spec, dx: 0.001 });
    expect(() => writeFrameResult(join(dir, 'f2'), { height, slopeX: other })).toThrow(MeniscusRangeError);
    expect(() => writeFrameResult(join(dir, 'f2'), { height, grids: { 'a/b': { grid: q, units: 'm' } } })).toThrow(MeniscusRangeError);
    const cyc: Record<string, unknown> = {};
    cyc.self = cyc;
    expect(() => writeFrameResult(join(dir, 'f2'), { height, meta: cyc })).toThrow(MeniscusTypeError);
  });
});
