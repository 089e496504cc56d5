// The wavelengths of a spectrum whose lines sit on one FFT lattice share their source's spectrum
// when the source does not depend on the wavelength (plan/share.ts sourceIgnoresWavelength): one
// forward transform, then per line a transfer multiply at its own wavelength and an inverse.
// Sharing must not change a result: the case equals the same case with every line computed from
// its own source, bit for bit (the same arithmetic on the same spectrum; common practice for a
// reuse that only skips recomputing an identical array).
import { describe, expect, it } from 'vitest';
import { planCase } from '../../src/plan/planner.js';
import { sourceSpectrumKey } from '../../src/plan/share.js';
import { computeSpectrum } from '../../src/run/spectrum-case.js';
import { sharesFfts } from '../../src/run/scheduler.js';
import type { Case, Plan } from '../../src/plan/types.js';
import type { Illumination } from '../../src/optics/aperture.js';
import type { SpectrumSource } from '../../src/analysis/spectrum.js';
import { spectrumLines } from '../../src/analysis/spectrum.js';
import { testContext } from '../engine.js';
import { makeCase, nm, um } from '../helpers.js';

// The midpoints of 560–700 nm in `samples` equal intervals, as lines (a band of them would be
// refined by the planner to as many samples as its fringes ask).
const band = (samples: number): SpectrumSource => ({
  kind: 'lines',
  lines: Array.from({ length: samples }, (_, i) => ({ wavelength: 560 * nm + ((i + 0.5) * 140 * nm) / samples, power: 1 })),
});

function spectrumCase(illumination: Illumination, spectrum: SpectrumSource, aperture: Case['aperture'] = { shape: 'rectangle', width: 200 * um, height: 150 * um, opaque: false }): Case {
  const lines = spectrumLines(spectrum);
  const mean = lines.reduce((t, l) => t + l.wavelength * l.weight, 0);
  return { ...makeCase({ wavelength: mean, distance: 8e-3, aperture, illumination, method: 'angular-spectrum' }), spectrum };
}

/** The same plan with no line marked as sharing (each line computes its own source's spectrum). */
function unshared(plan: Plan): Plan {
  const members = plan.spectrum!.members.map(({ sharedSpectrum: _s, ...m }) => m as Plan);
  return { ...plan, spectrum: { ...plan.spectrum!, members } };
}

describe("a spectrum's lines share their source's spectrum", () => {
  const plan = planCase(spectrumCase({ kind: 'plane', tilt: [0, 0] }, band(3)));
  const members = plan.spectrum!.members;

  it('plans the lines on each lattice as sharing one source, says so, and counts the kept spectrum in memory', () => {
    expect(plan.error).toBeUndefined();
    expect(members).toHaveLength(3);
    expect(members.every((m) => m.method === 'angular-spectrum')).toBe(true);
    // Here the two shorter wavelengths take one lattice and the longest a coarser one: one key per
    // lattice, though the wavelengths on it differ; the lone line keeps its own source.
    const lattice = (m: Plan) => `${m.x.inputPitch} ${m.x.paddedSamples} ${m.y!.paddedSamples}`;
    expect(lattice(members[0]!)).toBe(lattice(members[1]!));
    expect(lattice(members[2]!)).not.toBe(lattice(members[0]!));
    expect(sourceSpectrumKey(members[0]!)).toBe(sourceSpectrumKey(members[1]!));
    expect(sourceSpectrumKey(members[2]!)).not.toBe(sourceSpectrumKey(members[0]!));
    const id = members[0]!.sharedSpectrum!;
    expect(members.map((m) => m.sharedSpectrum)).toEqual([id, id, undefined]);
    expect(id.cases).toBe(2);
    expect(plan.reasons.some((r) => r.startsWith("the source's spectrum is shared across the wavelengths: 2 of the 3") && r.includes('(1 forward transform fewer)'))).toBe(true);
    // The largest line (its kept spectrum, one padded complex array, included) and four maps.
    const kept = 16 * members[0]!.x.paddedSamples * members[0]!.y!.paddedSamples;
    const alone = planCase({ ...members[0]!.case }, { outputGrid: [plan.x.output, plan.y!.output] });
    expect(members[0]!.memoryBytes).toBe(alone.memoryBytes + kept);
    expect(plan.memoryBytes).toBe(Math.max(...members.map((m) => m.memoryBytes)) + 4 * 8 * plan.x.output.n * plan.y!.output.n);
    // The work: the lines' own less the one forward transform spared, half of plan/costs.ts's two
    // (1.65·N·log₂N of the 3.3·N·log₂N).
    const np = members[1]!.x.paddedSamples * members[1]!.y!.paddedSamples;
    const own = members.reduce((t, m) => t + m.work, 0);
    expect(plan.work).toBeCloseTo(own - 1.65 * np * Math.log2(np), 0);
  });

  it('the shared case equals the unshared one bit for bit (sum, colour maps, diagnostics), and lets the kept spectrum go', () => {
    const ctx = testContext();
    const seen: (string | undefined)[] = [];
    const shared = computeSpectrum(plan, ctx, (_m, _w, c) => seen.push(c.diagnostics.sourceSpectrum));
    expect(seen).toEqual(['computed', 'reused', undefined]);
    expect(ctx.spectra.kept).toBeNull();
    const aloneSeen: (string | undefined)[] = [];
    const lines: Float64Array[] = [];
    const alone = computeSpectrum(unshared(plan), testContext(), (_m, _w, c) => (aloneSeen.push(c.diagnostics.sourceSpectrum), lines.push(c.intensity)));
    expect(aloneSeen).toEqual([undefined, undefined, undefined]);
    expect(Array.from(shared.computed.intensity)).toEqual(Array.from(alone.computed.intensity));
    for (const k of ['X', 'Y', 'Z'] as const) expect(Array.from(shared.colour[k])).toEqual(Array.from(alone.colour[k]));
    expect(shared.computed.diagnostics).toEqual(alone.computed.diagnostics);
    // The two sharing lines differ (the reuse did not hand back one wavelength's pattern twice).
    let most = 0;
    for (let k = 0; k < lines[0]!.length; k++) most = Math.max(most, Math.abs(lines[0]![k]! - lines[1]![k]!));
    expect(most).toBeGreaterThan(0.01);
  });

  it("gets an FFT team when its lines transform large grids, whatever the middle line's method (run/scheduler.ts)", () => {
    expect(members.every((m) => m.x.paddedSamples * m.y!.paddedSamples >= 2 ** 18)).toBe(true);
    expect(sharesFfts(plan)).toBe(true);
    // The case's own method is its middle line's: a direct sum there must not hide the others' FFTs.
    const boundary = { method: 'rayleigh-sommerfeld', form: 'boundary' } as const;
    expect(sharesFfts({ ...plan, ...boundary })).toBe(true);
    const noFfts = { ...plan, spectrum: { ...plan.spectrum!, members: members.map((m) => ({ ...m, ...boundary })) } };
    expect(sharesFfts(noFfts)).toBe(false);
  });

  it('tilted light is not shared across wavelengths (its carrier e^{i2πx·sinθ/λ} differs per line)', () => {
    const tilted = planCase(spectrumCase({ kind: 'plane', tilt: [0.002, 0] }, band(3)));
    expect(tilted.error).toBeUndefined();
    const ms = tilted.spectrum!.members.filter((m) => m.method === 'angular-spectrum');
    expect(ms.length).toBeGreaterThan(1);
    expect(new Set(ms.map(sourceSpectrumKey)).size).toBe(ms.length);
    expect(ms.every((m) => m.sharedSpectrum === undefined)).toBe(true);
    expect(tilted.reasons.some((r) => r.includes('shared across the wavelengths'))).toBe(false);
  });
});
