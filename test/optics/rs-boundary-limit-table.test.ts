// The tabulated phase limits of the boundary form (src/optics/rs-boundary-limit-table.ts) are the
// values its rules measure (src/optics/rs-boundary-rules.ts: the scan on e^{iωt}, common practice
// for fixing a quadrature's step by measurement); each entry checked here is measured again and
// must agree exactly, so the table cannot drift from the functions it stands in for.
import { describe, expect, it } from 'vitest';
import { gaussPhaseLimit, partialPhaseLimit } from '../../src/optics/rs-boundary-rules.js';
import { GAUSS32_PHASE_LIMITS, PARTIAL16_PHASE_LIMITS, TABLE_FIRST_STEP, TABLE_STEPS_PER_DECADE } from '../../src/optics/rs-boundary-limit-table.js';

describe('boundary-form phase-limit table', () => {
  it('covers the accuracies the boundary form asks for, 1e-14 to 1e-7, at 8 steps a decade', () => {
    expect(TABLE_STEPS_PER_DECADE).toBe(8);
    expect(10 ** (TABLE_FIRST_STEP / TABLE_STEPS_PER_DECADE)).toBeCloseTo(1e-14, 25);
    expect(GAUSS32_PHASE_LIMITS.length).toBe(57);
    expect(PARTIAL16_PHASE_LIMITS.length).toBe(57);
  });

  it('holds what the rules measure, exactly, at the ends and at entries drawn with a fixed seed', () => {
    // Park–Miller draws (seed 20261203): 10 entries besides the two ends.
    let seed = 20261203;
    const draw = () => (seed = (seed * 48271) % 2147483647) / 2147483647;
    const idx = new Set([0, GAUSS32_PHASE_LIMITS.length - 1]);
    while (idx.size < 12) idx.add(Math.floor(draw() * GAUSS32_PHASE_LIMITS.length));
    for (const i of idx) {
      const eps = 10 ** ((TABLE_FIRST_STEP + i) / TABLE_STEPS_PER_DECADE);
      expect(GAUSS32_PHASE_LIMITS[i], `gauss 32 at step ${TABLE_FIRST_STEP + i}`).toBe(gaussPhaseLimit(32, eps));
      expect(PARTIAL16_PHASE_LIMITS[i], `partial 16 at step ${TABLE_FIRST_STEP + i}`).toBe(partialPhaseLimit(16, eps));
    }
  });

  it('grows as the accuracy asked for loosens (a looser accuracy takes a longer panel)', () => {
    for (let i = 1; i < GAUSS32_PHASE_LIMITS.length; i++) {
      expect(GAUSS32_PHASE_LIMITS[i]!).toBeGreaterThanOrEqual(GAUSS32_PHASE_LIMITS[i - 1]!);
      expect(PARTIAL16_PHASE_LIMITS[i]!).toBeGreaterThanOrEqual(PARTIAL16_PHASE_LIMITS[i - 1]!);
    }
  });
});
