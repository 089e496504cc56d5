// Every warning a case can carry, in one place: its code, a one-line title for reports, whether it
// says the computed values may be off, and its message as a function of the details the site that
// raises it knows. Sites call warning(code, details) and hold no wording of their own, so a code is
// checked by the compiler (WarningCode is the union of this catalogue's keys) and a message reads
// the same wherever its condition is found. The texts are those the sites built before the
// catalogue, byte for byte (test/golden/warning-texts.mjs holds them); change them here only.
import { formatLength, trimNumber } from '../job/units.js';
import type { Warning } from '../plan/types.js';

/** Details of a warning whose message has no variable part. */
export type NoDetails = Record<string, never>;

export interface WarningEntry<D> {
  /** One line, for a report's list of warnings (unique across the catalogue). */
  title: string;
  /**
   * True when the warning says the computed values may be off (sampling, aliasing, an approximation
   * used where it does not hold, a failed consistency check); false when it speaks of the physics
   * (scalar theory near λ, evanescent light), of totals (light outside the window), or of what was
   * left out or cannot be read (orders outside, detectors outside, overlapping orders).
   */
  accuracy: boolean;
  message: (details: D) => string;
}

const entry = <D>(e: WarningEntry<D>): WarningEntry<D> => e;

// Number formats, as the sites had them: the planner's percentages carry 2 digits and a floor; the
// post-computation checks' carry 3.
const fmt = (x: number, digits = 3) => trimNumber(x, digits);
const len3 = (x: number) => formatLength(x, 3);
const len4 = (x: number) => formatLength(x, 4);
const pct = (x: number) => `${trimNumber(100 * x, 3)} %`;
function planPct(x: number): string {
  if (x < 1e-4) return '<0.01 %';
  return `${trimNumber(100 * x, 2)} %`;
}
/** Sorted order numbers with runs of consecutive ones as a…b. */
function orderList(ms: readonly number[]): string {
  const parts: string[] = [];
  for (let i = 0; i < ms.length; ) {
    let j = i;
    while (j + 1 < ms.length && ms[j + 1] === ms[j]! + 1) j++;
    parts.push(j > i ? `${ms[i]}…${ms[j]}` : `${ms[i]}`);
    i = j + 1;
  }
  return parts.join(', ');
}
/** The planner's advice after a paraxial or far-field warning: a valid method that fits, or null. */
const planAdvice = (instead: string | null) =>
  instead !== null
    ? `use method: ${instead} (valid here, and it fits)`
    : 'no valid method fits this case as given: narrow the window, or raise --max-memory or pass --accept-large';
/** Width (× height) of a window, full sizes in metres; height null for a 1-D case. */
const windowSize = (size: readonly [number, number | null]) => `${len3(size[0])}${size[1] !== null ? ` × ${len3(size[1])}` : ''}`;

/** Where an evanescent fraction comes from (analysis/validity.ts evanescentFraction). */
export type EvanescentSource = 'computed' | 'planner' | 'thin-grating' | 'none';
const SOURCE_WORDS: Record<EvanescentSource, string> = {
  computed: 'measured on the computed spectrum',
  planner: "the planner's model of the light",
  'thin-grating': 'thin-grating theory, Goodman §4.4',
  none: '',
};

/** An order whose light is not where the grating equation puts it (analysis/order-checks.ts). */
export interface MisplacedOrderDetails {
  m: number;
  /** z·tan θ_m (m). */
  position: number;
  /** θ_m (rad). */
  angle: number;
  /** Centroid of its light (m); null when its interval is dark. */
  centroid: number | null;
  /** z·sin θ_m when the light is nearer there (where a paraxial method puts it), else null. */
  paraxialAt: number | null;
  tolerance: number;
}

/** Light where no order lands. */
export interface StrayPeakDetails {
  position: number;
  /** Fraction of the transmitted power around it. */
  fraction: number;
  /** The order a paraxial method puts there: at z·sin θ; landsAt z·tan θ, null for an evanescent order. */
  paraxial: { order: number; at: number; landsAt: number | null } | null;
  /** The nearest order that lands; null when none lands. */
  nearest: { order: number; position: number } | null;
}

export interface OrderPowerDetails {
  m: number;
  measured: number;
  predicted: number;
  tolerance: number;
}

/** A measured order whose finite-grating power departs from the efficiency (analysis/order-checks.ts). */
export interface FiniteOrderDetails {
  m: number;
  measured: number;
  efficiency: number;
  model: number;
}

export interface DetectorOutsideDetails {
  kind: string;
  /** 1-based, as the job lists it. */
  number: number;
  size: number;
  at: [number, number];
  /** Fraction of its area (width in 1-D) inside the window: 0 when wholly outside. */
  inside: number;
}

export const WARNING_CATALOGUE = {
  // ---- before computing (src/plan/planner.ts)
  'lens-spherical': entry<{ method: string; phase: number; fresnelValid: boolean }>({
    title: 'The thin lens shows its own spherical aberration',
    // The computed field is right for the element as given (a quadratic phase), but not for an ideal
    // lens, which is what a thin lens is taken for (and what the Fresnel forms compute): the values
    // may be off against the lens the job means.
    accuracy: true,
    message: (d) =>
      `${d.method} propagates the thin lens's quadratic phase exactly, and that phase is ${fmt(d.phase, 2)} rad from a spherical wave about the focus at the rim of the lit pupil (kR⁴/(8f³) on the axis; for tilted light also the off-axis terms, which move the focus from z·sin θ to z·tan θ and blur it): the result shows that much aberration, which an ideal lens would not have; an ideal lens's field is the Fresnel result${d.fresnelValid ? ' (valid here)' : ''}`,
  }),
  'paraxial-lens': entry<{ phase: number; limit: number }>({
    title: 'The thin lens is paraxial',
    // What the result is (an ideal lens's field, paraxial positions), not a fault of the numbers.
    accuracy: false,
    message: (d) =>
      `the thin lens is paraxial: its quadratic phase is ${fmt(d.phase, 2)} rad from a spherical wave about its focus at the rim of the lit pupil (kR⁴/(8f³), limit ${d.limit} rad); with the Fresnel kernel, which drops the same order, the result is an ideal (aberration-free) lens's field with paraxial positions, not the exact field of the quadratic phase itself (which would show that much spherical aberration)`,
  }),
  'planes-paraxial': entry<{ leg: string; phase: number; limit: number }>({
    title: 'A gap between planes is outside the Fresnel approximation',
    accuracy: true,
    message: (d) =>
      `${d.leg}: the Fresnel integral that carries the light between planes drops ${fmt(d.phase, 2)} rad of phase variation across the lit region where the light lands (kρ⁴/(8z³), limit ${d.limit} rad): the light leaves at angles too steep for the paraxial approximation, so positions and fringes there are off; lengthen the gap or narrow the light, or compute that plane on its own (one element, method auto)`,
  }),
  'curved-light-paraxial': entry<{ source: string; fromSource: number; toScreen: number; limit: number }>({
    title: 'Curved light is beyond the paraxial approximation',
    // The Fresnel scaling that turns the curved light into flat light is paraxial on both legs,
    // whatever method computes the flat case: beyond the limit positions and fringes are off.
    accuracy: true,
    message: (d) =>
      `${d.source}: the curved light is computed by the Fresnel scaling theorem, which is paraxial on both legs, and it drops ${fmt(d.fromSource, 2)} rad of phase across the lit aperture from the source (kρ⁴/(8s³)) and ${fmt(d.toScreen, 2)} rad from the aperture to where the light lands (limit ${d.limit} rad each): fringes and positions may be off; move the source or the screen farther away, or light less of the aperture`,
  }),
  'planes-window-loss': entry<{ plane: number; loss: number; limit: number }>({
    title: 'Light lost between planes',
    accuracy: true,
    message: (d) =>
      `plane ${d.plane}: ${pct(d.loss)} of the light arriving there fell outside the region the planner sampled (limit ${pct(d.limit)}) and is missing from everything after it; the planner's estimate of where the light goes was too narrow here`,
  }),
  'planes-no-light': entry<{ plane: number }>({
    title: 'No light reaches a plane',
    accuracy: true,
    message: (d) => `plane ${d.plane}: the light from the plane before misses the element (by the planner's estimate): little or nothing reaches the screen, and what is computed is the far tail of the light`,
  }),
  'tilt-y-ignored': entry<NoDetails>({
    title: 'Tilt along the slits ignored',
    accuracy: false,
    message: () => 'illumination.tilt[1] (along the slits) is ignored: a 1-D aperture is computed in the x–z plane only',
  }),
  'orders-outside': entry<{ orders: readonly number[]; fraction: number; windowGiven: boolean; maxOutput: number }>({
    title: 'Grating orders land outside the window',
    accuracy: false,
    message: (d) =>
      `propagating orders ${orderList(d.orders)} (${planPct(d.fraction)} of the power that reaches the screen) land outside the window` +
      (d.windowGiven
        ? ' the job gives; they are listed in the order table as outside; widen the window to see them'
        : `: holding them at a pitch that resolves each order would take more output samples than the ${d.maxOutput} per axis allowed; they are listed in the order table as outside; give a window around the orders of interest`),
  }),
  'spectrum-sampled-coarsely': entry<{ samples: number; needed: number; step: number }>({
    title: 'A band sampled coarser than its pattern moves',
    accuracy: true,
    message: (d) =>
      `the band is computed at ${d.samples} wavelengths ${nmStep(d.step)} apart; for the intensity anywhere on the grid to move by no more than half a fringe between them it would take ${d.needed}: where the light is dispersed the map shows the samples as separate lines rather than a continuous spread, and its values there are off; narrow the band or give more samples (spectrum.samples)`,
  }),
  'detector-powers-scalar': entry<{ ratio: number; limit: number }>({
    title: 'Detector powers from thin-grating theory where λ/d is large',
    accuracy: true,
    message: (d) =>
      `λ/d reaches ${fmt(d.ratio, 3)} (above about ${fmt(d.limit, 2)}): where each line lands on the detector follows the grating equation exactly, but the power thin-grating scalar theory gives each order is unreliable there (the groove shape, depth and the light's polarisation decide it; a rigorous vector method is needed for the powers and the pixel values)`,
  }),
  'near-wavelength': entry<{ cause: 'feature'; feature: number; ratio: number } | { cause: 'screen'; ratio: number }>({
    title: 'Feature or screen within a few wavelengths: scalar theory unreliable',
    accuracy: false,
    message: (d) =>
      d.cause === 'feature'
        ? `the smallest feature (${len3(d.feature)}) is only ${fmt(d.ratio, 2)} λ: scalar diffraction loses accuracy there (polarisation, edge and thickness effects); a rigorous vector method is needed for quantitative results`
        : `the screen is only ${fmt(d.ratio, 2)} λ from the aperture: the evanescent near field of the real screen (its thickness, material and polarisation) dominates there, which scalar diffraction does not describe; a rigorous vector method is needed for quantitative results`,
  }),
  'little-light': entry<{ waist: number; passing: number; openFrom: number }>({
    title: 'Only the far tail of the beam passes',
    accuracy: true,
    message: (d) =>
      `the ${len3(d.waist)} beam passes only about ${d.passing.toExponential(1)} of its power (the open part begins ${len3(d.openFrom)} from its axis, ${fmt(d.openFrom / d.waist, 2)} beam radii): the result is the beam's far tail, where the computed values are at the level of rounding and of the beam's truncation, and their relative accuracy is not controlled`,
  }),
  'undersampled-feature': entry<{ samples: number; feature: number; needed: number }>({
    title: 'Too few samples across the smallest feature',
    accuracy: true,
    message: (d) => `only ${fmt(d.samples, 2)} samples across the smallest feature (${len3(d.feature)}); at least ${d.needed} are needed for its edges to be resolved`,
  }),
  'coarse-sampling': entry<{ pitch: number; required: number; rule: string }>({
    title: 'Pitch coarser than the accuracy target',
    accuracy: true,
    // The rule is the axis's pitch rule; for a given pitch it wraps the rule that was not met, which
    // is all the message needs.
    message: (d) =>
      `pitch ${len3(d.pitch)} is coarser than the ${len3(d.required)} the accuracy target needs (${d.rule.replace(/^grid\.pitch as given \(the accuracy rules ask for [^:]*: /, '').replace(/\)$/, '')}); expect aliasing or missing fringes`,
  }),
  'grid-too-small': entry<{ covers: 'aperture-and-window'; samples: number; pitch: number } | { covers: 'aperture'; samples: number; pitch: number; aperture: number }>({
    title: 'Grid does not cover the aperture',
    accuracy: true,
    message: (d) =>
      d.covers === 'aperture-and-window'
        ? `the grid (${d.samples} × ${len3(d.pitch)} = ${len3(d.samples * d.pitch)}) does not cover the aperture and the window; the field is cut and wraps around`
        : `the grid (${d.samples} × ${len3(d.pitch)}) does not cover the aperture (${len3(d.aperture)}): the aperture is cut`,
  }),
  paraxial: entry<{ at: [number, number | null]; phase: number; weight: number; weighted: number; limit: number; goodmanRatio: number; instead: string | null }>({
    title: 'Paraxial approximation off where the light lands',
    accuracy: true,
    message: (d) =>
      `the Fresnel (paraxial) approximation is off where light lands: at (${len3(d.at[0])}${d.at[1] === null ? '' : `, ${len3(d.at[1])}`}) it drops ${fmt(d.phase, 2)} rad of phase across the aperture where the light is ${planPct(d.weight)} of the peak (weighted ${fmt(d.weighted, 2)} rad, limit ${d.limit} rad; Goodman's sufficient condition ratio ${fmt(d.goodmanRatio, 2)}): positions and intensities there are off; ${planAdvice(d.instead)}`,
  }),
  'not-far-field': entry<{ phase: number; fresnelNumber: number; farFieldDistance: number; peakError: number; instead: string | null }>({
    title: 'Screen not yet in the far field',
    accuracy: true,
    message: (d) =>
      `the far-field formula neglects the aperture's quadratic phase π·N_F = ${fmt(d.phase, 2)} rad here (N_F = ${fmt(d.fresnelNumber, 3)}; far field from ${len3(d.farFieldDistance)}), about ${planPct(d.peakError)} at the peak: the pattern is not yet the far-field one; ${planAdvice(d.instead)}`,
  }),
  'transfer-undersampled': entry<{ sampling: number }>({
    title: 'Fresnel transfer function under-sampled',
    accuracy: true,
    message: (d) =>
      `the Fresnel transfer function is under-sampled (Δx = ${fmt(d.sampling, 2)}·λz/L < λz/L, Voelz): expect aliasing; without grid.size the planner picks a Fresnel form that is sampled correctly here`,
  }),
  'output-undersampled': entry<{ pitch: number; nyquist: number; window: number }>({
    title: 'Output pitch too coarse for the fringes',
    accuracy: true,
    message: (d) =>
      `the output pitch ${len3(d.pitch)} is coarser than the intensity's Nyquist pitch λz/(2D) = ${len3(d.nyquist)}: fringes are not resolved in the window (${len3(d.window)}); narrow the window`,
  }),

  // ---- after computing (src/analysis/validity.ts)
  'window-loss': entry<{
    loss: number;
    /** Behind an obstacle the loss is of the light it removes (Babinet). */
    babinet: boolean;
    /** Evanescent fraction set apart from the power that reaches the screen. */
    evanescent: number;
    /** Full width and height (null in 1-D), m. */
    window: [number, number | null];
    limit: number;
    /** What follows: nothing (an obstacle in a plane wave), or advice for a given window or the planner's one. */
    then: 'nothing' | 'window-given' | 'as-planned' | 'unexpected';
    /** The planner's own estimate of the loss. */
    expected: number;
  }>({
    title: 'Light falls outside the window',
    accuracy: false,
    message: (d) => {
      const what = d.babinet
        ? 'of the light the obstacle removes (its complementary hole, by Babinet)'
        : d.evanescent > 0
          ? `of the power that reaches the screen (the power through the aperture less the ${pct(d.evanescent)} that goes into evanescent waves)`
          : 'of the power through the aperture';
      const head = `${pct(d.loss)} ${what} falls outside the ${windowSize(d.window)} window (limit ${pct(d.limit)})`;
      switch (d.then) {
        case 'nothing':
          return head;
        case 'window-given':
          return head + ': totals and encircled energies are low by that much; widen the window the job gives, or leave window out so that the planner sizes it';
        case 'as-planned':
          return (
            head +
            `, about what the planner expected when it chose this window (${pct(d.expected)}; its reasons say what it left out and why); ` +
            'totals and encircled energies are low by that much; a window given in the job around the light of interest holds it'
          );
        case 'unexpected':
          return (
            head +
            `: unexpected for the window the planner chose, which it expected to miss about ${pct(d.expected)}; ` +
            'totals and encircled energies are low by that much; a wider window given in the job holds more'
          );
      }
    },
  }),
  'power-excess': entry<{ excess: number }>({
    title: 'More power in the window than went through the aperture',
    accuracy: true,
    message: (d) =>
      `the window holds ${pct(d.excess)} more power than went through the aperture: the result is aliased or under-sampled (check grid.pitch and the window); do not trust it`,
  }),
  'edge-energy': entry<{ fraction: number; frame: number; gridGiven: boolean; padded: [number, number | null] }>({
    title: 'Light wraps around the FFT grid',
    accuracy: true,
    message: (d) =>
      `${pct(d.fraction)} of the power reaches the outer ${trimNumber(100 * d.frame, 2)} % of the padded grid: light wraps around the periodic FFT grid into the window; ` +
      (d.gridGiven
        ? 'use a larger grid.size, or leave grid.size out so that the planner sizes the grid'
        : `unexpected for the grid the planner chose (${d.padded[0]}${d.padded[1] !== null ? ` × ${d.padded[1]}` : ''} samples padded); give a larger grid.size`),
  }),
  'band-limit': entry<{ fraction: number; gridGiven: boolean }>({
    title: 'Angular-spectrum band limit removed light',
    accuracy: true,
    message: (d) =>
      `the angular-spectrum band limit removed ${pct(d.fraction)} of the spectral power (light at angles the grid cannot carry to this distance without aliasing); the window misses that light; ${
        d.gridGiven ? 'use a larger grid.size' : 'unexpected for the grid the planner chose; give a larger grid.size'
      }`,
  }),
  evanescent: entry<{ fraction: number; cutoff: [number, number] | null; source: EvanescentSource; nearWavelength: boolean }>({
    title: 'Light goes into evanescent waves',
    accuracy: false,
    message: (d) =>
      `${pct(d.fraction)} of the light through the aperture goes into evanescent waves${d.cutoff ? ` (the grating orders m ≤ ${d.cutoff[0]} and m ≥ ${d.cutoff[1]})` : ''}: spatial frequencies above 1/λ, which decay within a few wavelengths of the aperture and carry no power to any screen ` +
      `(${SOURCE_WORDS[d.source]}). This is physics, not a fault of the window: the screen can receive at most ${pct(1 - d.fraction)} of that power. ` +
      (d.nearWavelength
        ? 'Features near or below λ make it: scalar theory is not reliable here; a rigorous vector method is needed for quantitative results'
        : "It comes from the aperture's sharp edges; in a real part, thickness and vector effects change how much"),
  }),

  // ---- grating checks after computing (src/analysis/order-checks.ts, src/run/run-case.ts)
  'orders-misplaced': entry<{ misplaced: readonly MisplacedOrderDetails[]; stray: readonly StrayPeakDetails[]; sampleStep: number; advice: string }>({
    title: 'Grating orders not where the grating equation puts them',
    accuracy: true,
    message: (d) => {
      const parts: string[] = [];
      if (d.misplaced.length) {
        const n = d.misplaced.length;
        const list = d.misplaced.slice(0, 6).map((c) => {
          const deg = trimNumber((c.angle * 180) / Math.PI, 4);
          const at = c.centroid === null ? 'its interval is dark' : `its light is centred at ${len4(c.centroid)}`;
          const parax = c.paraxialAt !== null ? ` (about z·sin θ = ${len4(c.paraxialAt)}, where a paraxial method puts it)` : '';
          return `order ${c.m}: ${at}${parax}, but the grating equation puts it at z·tan θ = ${len4(c.position)} (θ = ${deg}°)${
            c.centroid === null ? '' : `, ${len4(Math.abs(c.centroid - c.position))} off`
          }, tolerance ${len4(c.tolerance)}`;
        });
        parts.push(
          `${n === 1 ? 'an order is' : `${n} orders are`} not where they should be — ${list.join('; ')}${n > 6 ? `; and ${n - 6} more` : ''} (centroids over each order's interval, less the small shift this finite grating's envelope gives them; tolerance: the larger of one output sample, ${len4(d.sampleStep)}, and 1 % of the order's distance from the axis)`,
        );
      }
      if (d.stray.length) {
        const n = d.stray.length;
        const list = d.stray.slice(0, 4).map(
          (s) =>
            `a peak at ${len4(s.position)} holding ${pct(s.fraction)} of the transmitted power` +
            (s.paraxial !== null
              ? s.paraxial.landsAt === null
                ? `, where a paraxial method lands the evanescent order ${s.paraxial.order} (z·sin θ = ${len4(s.paraxial.at)}; it should reach no screen at all)`
                : `, where a paraxial method puts order ${s.paraxial.order} (z·sin θ = ${len4(s.paraxial.at)}; it lands at z·tan θ = ${len4(s.paraxial.landsAt)})`
              : '') +
            (s.nearest !== null ? `; the nearest order that lands is ${s.nearest.order}, at ${len4(s.nearest.position)}` : ''),
        );
        parts.push(`light where no order lands: ${list.join('; ')}${n > 4 ? `; and ${n - 4} more such peaks` : ''}`);
      }
      return `${parts.join('. Also ')}. The computation itself is off here, not the physics: ${d.advice}`;
    },
  }),
  'orders-power': entry<{ orders: readonly OrderPowerDetails[]; farField: boolean; advice: string }>({
    title: 'Grating order powers off thin-grating theory',
    accuracy: true,
    message: (d) => {
      const n = d.orders.length;
      const list = d.orders
        .slice(0, 6)
        .map((c) => `order ${c.m}: ${pct(c.measured)} of the transmitted power measured, ${pct(c.predicted)} predicted (allowed ±${pct(c.tolerance)})`);
      return (
        `the power of ${n === 1 ? 'an order' : `${n} orders`} differs from thin-grating theory (Goodman §4.4: (w/d)·sinc²(m·w/d) of the power through the slits) by more than a correct computation of this finite grating allows — ` +
        `${list.join('; ')}${n > 6 ? `; and ${n - 6} more` : ''}. ` +
        `The allowance is twice this finite grating's own departure from the thin-grating value (its far-field model)${d.farField ? '' : " and from its orders' 1/u tails"}, plus what the window misses and 0.5 % for the method's own accuracy. ` +
        `The computation itself is off here: ${d.advice}`
      );
    },
  }),
  'orders-finite': entry<{ count: number; orders: readonly FiniteOrderDetails[]; ofIncident: boolean; departure: number }>({
    title: "Grating order powers are this finite grating's, not the efficiencies",
    accuracy: true,
    message: (d) => {
      const of = d.ofIncident ? 'of the incident power' : 'of the transmitted power';
      const list = d.orders
        .slice(0, 6)
        .map((o) => `order ${o.m}: ${pct(o.measured)} measured, ${pct(o.model)} by this grating's far-field model, efficiency ${pct(o.efficiency)}`);
      return (
        `the order table's powers (${of}) are those of this grating of ${d.count} ${d.count === 1 ? 'period' : 'periods'}, not the efficiencies of thin-grating theory (Goodman §4.4, an infinite grating): ` +
        `each order is a beam whose side lobes spill into its neighbours' intervals, which moves up to ${pct(d.departure)} of the power between orders — ` +
        `${list.join('; ')}${d.orders.length > 6 ? `; and ${d.orders.length - 6} more` : ''}. ` +
        `The intensity map is not affected; read the efficiencies from the predicted fractions, or use more periods (the departure falls as 1/N)`
      );
    },
  }),
  'orders-window': entry<{ shortfall: number; orders: readonly { m: number; measured: number; shortBy: number }[]; ofIncident: boolean; twoD: boolean }>({
    title: 'Grating order powers short by the light outside the window',
    accuracy: true,
    message: (d) => {
      const list = d.orders.slice(0, 6).map((o) => `order ${o.m}: ${pct(o.measured)} measured, about ${pct(o.shortBy)} of it outside`);
      return (
        `${pct(d.shortfall)} of the light that reaches the screen passes beyond the window's edges${d.twoD ? ' (along y as well as x: each order spreads along the lines as the grating\'s length diffracts it)' : ''}, ` +
        `so every order's power in the order table (${d.ofIncident ? 'of the incident power' : 'of the transmitted power'}) is low by about that share of it — ${list.join('; ')}${d.orders.length > 6 ? `; and ${d.orders.length - 6} more` : ''}. ` +
        `Give a wider window (window in the job) to measure the orders' powers in full`
      );
    },
  }),
  'orders-unresolved': entry<{ distance: number; orders: readonly number[]; gratingWidth: number; separateBeyond: number | null }>({
    title: 'Grating orders overlap on the screen',
    accuracy: false,
    message: (d) =>
      `at ${len4(d.distance)} the orders ${d.orders.length > 6 ? `${d.orders[0]}…${d.orders[d.orders.length - 1]}` : d.orders.join(', ')} overlap on the screen (each is a beam as wide as the grating's ${len3(d.gratingWidth)}, widened by its diffraction): the light between two orders is theirs together, so their powers are left empty in the order table` +
      (d.separateBeyond !== null ? `; they separate beyond about ${len3(d.separateBeyond)}` : '; with so few lines they never separate fully'),
  }),

  // ---- the job's detectors (src/metrics/detectors.ts)
  'detector-outside': entry<{
    detectors: readonly DetectorOutsideDetails[];
    /** The window: full width and height (null in 1-D) and its centre (y null in 1-D), m. */
    window: { size: [number, number | null]; centre: [number, number | null] };
    windowGiven: boolean;
  }>({
    title: 'Detector partly or wholly outside the window',
    accuracy: false,
    message: (d) => {
      const twoD = d.window.size[1] !== null;
      const items = d.detectors.map((det) => {
        const where = `${det.kind} ${det.number} (${len3(det.size)} at ${len4(det.at[0])}${twoD ? `, ${len4(det.at[1])}` : ''})`;
        return det.inside === 0
          ? `${where} lies wholly outside the window: it has no value (null)`
          : `${where} has ${trimNumber(100 * (1 - det.inside), 3)} % of its ${twoD ? 'area' : 'width'} outside the window: its value counts only the part inside and is a lower bound`;
      });
      const centre = d.window.centre;
      const win = `${windowSize(d.window.size)} window centred at ${len4(centre[0])}${twoD && centre[1] !== null ? `, ${len4(centre[1])}` : ''}`;
      return `${items.join('; ')} (the ${win}); ${d.windowGiven ? 'widen the window the job gives' : 'give a window in the job that covers it'} or move the detector`;
    },
  }),

  // ---- reflection gratings (src/analysis/grating-answers.ts)
  'reflection-depth-oblique': entry<{ depth: number; cosIncidence: number; orders: readonly { m: number; waves: number }[] }>({
    title: 'Reflection grating: groove phase far from its value at these orders',
    accuracy: true,
    message: (d) =>
      `the reflection grating's groove phase is computed as ${fmt(d.depth)} wave(s) for every order, its value for an order leaving along the specular or the Littrow direction (the groove's path 2h·cos θ_i, cos θ_i = ${fmt(d.cosIncidence, 4)}); an order leaving at θ_m meets the path h·(cos θ_i + cos θ_m), which differs here by ` +
      `${d.orders.slice(0, 6).map((o) => `${fmt(o.waves, 2)} wave at order ${o.m}`).join(', ')}${d.orders.length > 6 ? ` and more at ${d.orders.length - 6} other orders` : ''}, so the computed powers of these orders may be off. ` +
      'Use the grating nearer its Littrow or specular direction, or read these orders\' powers as estimates',
  }),
};

/** A wavelength step in nm. */
function nmStep(m: number): string {
  return `${Number((m * 1e9).toPrecision(3))} nm`;
}

export type WarningCode = keyof typeof WARNING_CATALOGUE;
export type WarningDetails<C extends WarningCode> = (typeof WARNING_CATALOGUE)[C] extends WarningEntry<infer D> ? D : never;
type DetailsArgument<C extends WarningCode> = WarningDetails<C> extends NoDetails ? [details?: NoDetails] : [details: WarningDetails<C>];

/** Every code, in catalogue order. */
export const WARNING_CODES = Object.keys(WARNING_CATALOGUE) as WarningCode[];

/** The codes that say the computed values may be off (accuracy: true), in catalogue order. */
export const ACCURACY_CODES: readonly WarningCode[] = WARNING_CODES.filter((c) => WARNING_CATALOGUE[c].accuracy);

/** A warning with the catalogue's message for these details. */
export function warning<C extends WarningCode>(code: C, ...[details]: DetailsArgument<C>): Warning {
  const e = WARNING_CATALOGUE[code] as WarningEntry<WarningDetails<C>>;
  return { code, message: e.message((details ?? {}) as WarningDetails<C>) };
}

/** The report title of a code. */
export function warningTitle(code: WarningCode): string {
  return WARNING_CATALOGUE[code].title;
}

/** Whether a code (any string, e.g. one read back from a result.json) says the computed values may be off. */
export function isAccuracyWarning(code: string): boolean {
  return Object.hasOwn(WARNING_CATALOGUE, code) && WARNING_CATALOGUE[code as WarningCode].accuracy;
}

/** The first warning of each code among the lists, in order: a case made of several (a spectrum's lines) says each once. */
export function firstOfEachCode(...lists: readonly (readonly Warning[])[]): Warning[] {
  const seen = new Set<string>();
  const out: Warning[] = [];
  for (const list of lists) {
    for (const w of list) {
      if (seen.has(w.code)) continue;
      seen.add(w.code);
      out.push(w);
    }
  }
  return out;
}
