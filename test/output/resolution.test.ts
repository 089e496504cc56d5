// Two incoherent lines read off a sampled profile (analysis/resolution.ts). Rayleigh's criterion:
// equal sinc² lines one first zero apart dip to 2·sinc²(½) = 8/π² = 81.06 % at the midpoint; two
// Airy patterns 1.22λ/D apart dip to 2·[2J₁(v/2)/(v/2)]² at v = 3.8317 (the first zero of J₁,
// Abramowitz & Stegun table 9.5) = 73.6 % (Born & Wolf §7.6.3 and §8.6.2 quote about 73.5 %).
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { RAYLEIGH_DIP, readTwoLines } from '../../src/analysis/resolution.js';

const sinc2 = (u: number) => (u === 0 ? 1 : (Math.sin(Math.PI * u) / (Math.PI * u)) ** 2);
const airy = (v: number) => (v === 0 ? 1 : ((2 * besselj1(v)) / v) ** 2);

/** Two equal lines `sep` apart (in the pattern's own units), sampled finely. */
function pair(f: (u: number) => number, sep: number, step = 1e-3, span = 4) {
  const n = Math.round((2 * span) / step) + 1;
  const x = Array.from({ length: n }, (_, i) => -span + i * step);
  const I = x.map((u) => f(u + sep / 2) + f(u - sep / 2));
  const at = (u: number) => Math.round((u + span) / step);
  return readTwoLines(I, at(-sep / 2), at(sep / 2), Math.round(0.2 / step))!;
}

describe('two lines, resolved or not (Rayleigh)', () => {
  it('8/π² is 81.06 %, the dip of two sinc² lines one zero apart: just resolved', () => {
    expect(RAYLEIGH_DIP).toBeCloseTo(0.8106, 4);
    const r = pair(sinc2, 1);
    expect(r.dip).toBeGreaterThan(0.8);
    expect(r.dip).toBeLessThanOrEqual(RAYLEIGH_DIP + 1e-9);
    expect(r.resolved).toBe(true);
  });
  it('sinc² lines 0.9 of a zero apart are not resolved; 1.2 apart are', () => {
    expect(pair(sinc2, 0.9).resolved).toBe(false);
    expect(pair(sinc2, 1.2).resolved).toBe(true);
  });
  it('two Airy patterns at 1.22λ/D dip to 73.6 % (Born & Wolf: about 73.5 %)', () => {
    const v0 = 3.8317;
    const r = pair(airy, v0, 1e-3, 8);
    expect(r.dip).toBeCloseTo(2 * airy(v0 / 2), 3);
    expect(r.dip).toBeGreaterThan(0.73);
    expect(r.dip).toBeLessThan(0.74);
    expect(r.resolved).toBe(true);
  });
  it('says nothing where the two peaks merge into one', () => {
    const I = Array.from({ length: 101 }, (_, i) => Math.exp(-(((i - 50) / 20) ** 2)));
    expect(readTwoLines(I, 49, 51, 3)).toBeNull();
  });
});
