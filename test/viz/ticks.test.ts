import { describe, expect, it } from 'vitest';
import { MeniscusRangeError } from '../../src/core/index.js';
import { formatTick, lengthUnit, niceNumber, niceTicks } from '../../src/viz/index.js';

describe('nice numbers and ticks (Heckbert 1990, "Nice numbers for graph labels", Graphics Gems)', () => {
  it('niceNumber rounds to 1, 2, 5 × 10^n', () => {
    expect(niceNumber(0.0037)).toBe(0.005);
    expect(niceNumber(1.4)).toBe(1);
    expect(niceNumber(2.9)).toBe(2);
    expect(niceNumber(7.5)).toBe(10);
    expect(niceNumber(130)).toBe(100);
    expect(niceNumber(1.1, false)).toBe(2);
    expect(niceNumber(0.3, false)).toBe(0.5);
    expect(() => niceNumber(0)).toThrow(MeniscusRangeError);
  });
  it('niceTicks', () => {
    expect(niceTicks(-0.0023, 0.0041).values).toEqual([-0.002, 0, 0.002, 0.004]);
    expect(niceTicks(0, 1, 6).values).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(0.1, 0.7, 4).values).toEqual([0.2, 0.4, 0.6]);
    expect(() => niceTicks(1, 1)).toThrow(MeniscusRangeError);
  });
  it('formatTick', () => {
    expect(formatTick(0.25, 0.05)).toBe('0.25');
    expect(formatTick(-0.2, 0.2)).toBe('-0.2');
    expect(formatTick(1500, 500)).toBe('1500');
    expect(formatTick(0.00002, 0.00001)).toBe('2e-5');
    expect(formatTick(0.000025, 0.000005)).toBe('2.5e-5');
    expect(formatTick(0)).toBe('0');
    expect(formatTick(3)).toBe('3');
  });
  it('lengthUnit picks the SI prefix', () => {
    expect(lengthUnit(0.004).symbol).toBe('mm');
    expect(lengthUnit(0.25).symbol).toBe('cm');
    expect(lengthUnit(0.25, false).symbol).toBe('mm');
    expect(lengthUnit(3).symbol).toBe('m');
    expect(lengthUnit(2e-5).symbol).toBe('µm');
    expect(lengthUnit(0.001).symbol).toBe('mm');
    expect(lengthUnit(0).symbol).toBe('m');
  });
});
