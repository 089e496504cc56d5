// A case of several wavelengths: each line's plan is carried out in turn onto the case's one output
// grid (plan/spectrum.ts put every line there) and its intensity added with the line's weight; the
// CIE 1931 tristimulus maps are summed alongside for the colour picture. One line's map is held at
// a time, so a case of many wavelengths needs the memory of its largest line and four maps.
import { colourMatching } from '../analysis/colour.js';
import { energyCurve } from '../analysis/encircled.js';
import { linePairs, type LineOrders } from '../analysis/line-pairs.js';
import { spotMetrics } from '../analysis/metrics.js';
import { postChecks } from '../analysis/validity.js';
import { readDetectors } from '../metrics/detectors.js';
import { encircledRadii } from '../metrics/encircled.js';
import { powerAccount } from '../metrics/window.js';
import type { CaseMetrics, CaseRecord } from '../output/case-output.js';
import type { Plan, Warning } from '../plan/types.js';
import { computeCase, type ComputedCase, type Diagnostics } from './compute.js';
import type { CaseContext } from './context.js';
import { gratingPart } from './run-case.js';
import { gratingUse } from '../analysis/grating-answers.js';
import { firstOfEachCode } from '../warnings/catalogue.js';
import { spectrometerPart } from '../metrics/spectrometer.js';

/** The tristimulus values X, Y, Z per output sample: Σ weight·I_λ·[x̄, ȳ, z̄](λ). */
export interface ColourMaps {
  X: Float64Array;
  Y: Float64Array;
  Z: Float64Array;
}

export interface SpectrumComputed {
  computed: ComputedCase;
  colour: ColourMaps;
}

/** One wavelength's own map on the case's grid (output.lineMaps), unweighted. */
export interface LineMap {
  wavelength: number;
  intensity: Float64Array;
}

/**
 * Computes every line of a spectrum plan and adds them up. `onLine` sees each line's own plan and
 * result (the order table per wavelength, its checks) before the next replaces it.
 */
export function computeSpectrum(plan: Plan, ctx: Pick<CaseContext, 'engine' | 'spectra'>, onLine?: (member: Plan, weight: number, computed: ComputedCase) => void): SpectrumComputed {
  if (plan.error) throw new Error(plan.error);
  const sp = plan.spectrum!;
  const n = plan.x.output.n * (plan.y ? plan.y.output.n : 1);
  const sum = new Float64Array(n);
  const colour: ColourMaps = { X: new Float64Array(n), Y: new Float64Array(n), Z: new Float64Array(n) };
  const d: Diagnostics = { powerIn: 0, powerInWindow: 0 };
  let first: ComputedCase | null = null;
  // Lines that share their source's spectrum (plan/share.ts) find it kept in ctx.spectra from the
  // first of them on; it is of no use after the case, so it is let go however the case ends.
  const shared = new Set(sp.members.flatMap((m) => (m.sharedSpectrum ? [m.sharedSpectrum.id] : [])));
  try {
    sp.members.forEach((member, i) => {
      const w = sp.lines[i]!.weight;
      const m = computeCase(member, ctx);
      if (m.intensity.length !== n) throw new Error(`the line at ${member.case.wavelength} m came back with ${m.intensity.length} samples, not the grid's ${n}`);
      const [xb, yb, zb] = colourMatching(member.case.wavelength);
      const I = m.intensity;
      // The sum and the three tristimulus maps in one pass (the same products as one map at a time).
      const { X, Y, Z } = colour;
      for (let k = 0; k < n; k++) {
        const v = w * I[k]!;
        sum[k] = sum[k]! + v;
        X[k] = X[k]! + v * xb;
        Y[k] = Y[k]! + v * yb;
        Z[k] = Z[k]! + v * zb;
      }
      const md = m.diagnostics;
      d.powerIn += w * md.powerIn;
      d.powerInWindow += w * md.powerInWindow;
      if (md.bandLimitLoss !== undefined) d.bandLimitLoss = Math.max(d.bandLimitLoss ?? 0, md.bandLimitLoss);
      if (md.evanescentLoss !== undefined) d.evanescentLoss = Math.max(d.evanescentLoss ?? 0, md.evanescentLoss);
      if (md.edgeEnergy !== undefined) d.edgeEnergy = Math.max(d.edgeEnergy ?? 0, md.edgeEnergy);
      first ??= m;
      onLine?.(member, w, m);
    });
  } finally {
    if (ctx.spectra.kept && shared.has(ctx.spectra.kept.key)) ctx.spectra.kept = null;
  }
  const f = first!;
  return { computed: { nx: f.nx, ny: f.ny, dx: f.dx, dy: f.dy, x0: f.x0, y0: f.y0, intensity: sum, center: f.center, diagnostics: d }, colour };
}

/** A spectrum case end to end, without I/O: every line, their sum, its metrics and the answers per line. */
export function runSpectrumCase(plan: Plan, ctx: Pick<CaseContext, 'engine' | 'spectra'>): CaseRecord {
  const t0 = performance.now();
  const sp = plan.spectrum!;
  const c = plan.case;
  // Each line's warnings after the plan's, each code once (catalogue.ts firstOfEachCode).
  const found: Warning[][] = [];
  const add = (ws: Warning[]) => found.push(ws);
  const lineOrders: LineOrders[] = [];
  const lineMaps: LineMap[] = [];
  const { computed, colour } = computeSpectrum(plan, ctx, (member, weight, m) => {
    // (Kept only when the job asks: the plan's memory estimate counts them then.)
    if (c.output.lineMaps) lineMaps.push({ wavelength: member.case.wavelength, intensity: m.intensity.slice() });
    const g = gratingPart(member, m);
    if (g) {
      lineOrders.push({ wavelength: member.case.wavelength, weight, orders: g.metrics.orders ?? [] });
      add(g.warnings);
    }
    add(postChecks(member, m.diagnostics, g?.evanescence));
  });
  const d = computed.diagnostics;
  const spot = spotMetrics(computed);
  const reference = plan.babinet ? null : d.powerIn;
  const centre: [number, number] = [spot.centroid[0], spot.centroid[1] ?? 0];
  const energy = reference ? energyCurve(computed, centre, reference) : null;
  const detectors = readDetectors(plan, computed, centre, c.aperture.opaque ? null : reference);
  add(detectors.warnings);
  const metrics: CaseMetrics = {
    ...spot,
    ...powerAccount(spot.powerInWindow, reference, plan.babinet ? d.powerIn : undefined),
    encircled: encircledRadii(energy, centre),
    detectors: detectors.results,
    spectrum: {
      light: sp.words,
      normalisation: 'intensities are relative to the total incident irradiance (all wavelengths together); each line weighted by its fraction of the power',
      samples: sp.samples,
      lines: sp.lines.map((l, i) => ({ wavelength: l.wavelength, weight: l.weight, method: sp.members[i]!.method, ...(sp.members[i]!.form ? { form: sp.members[i]!.form } : {}) })),
    },
  };
  if (lineOrders.length) {
    const use = gratingUse(plan);
    if (use) metrics.spectroscopy = use;
    metrics.lineOrders = lineOrders;
    // Pairs of lines the light has as lines: a band's samples stand for a continuum, not for lines
    // to resolve.
    if (c.spectrum?.kind === 'lines') metrics.linePairs = linePairs(computed, lineOrders);
  }
  // The job's spectrometer: every line on its detector (each line's element at its wavelength).
  const spectrometer = spectrometerPart(plan, sp.members.map((m, i) => ({ wavelength: m.case.wavelength, weight: sp.lines[i]!.weight, aperture: m.case.aperture })));
  if (spectrometer) metrics.spectrometer = spectrometer.metrics;
  const warnings = firstOfEachCode(plan.warnings, ...found);
  return { plan, computed, metrics, energy, warnings, colour, ...(c.output.lineMaps ? { lineMaps } : {}), ...(spectrometer ? { detector: spectrometer.signal } : {}), seconds: (performance.now() - t0) / 1000 };
}
