// How fine the cells of the 2-D exact sums (rs-2d-cells.ts, rs-2d-sum.ts) must be for an accuracy
// target, from measured error laws. Errors are the worst |I − I_ref| over the window divided by the
// largest I_ref in it (a window that holds the pattern's main lobe), with I_ref the exact first
// Rayleigh–Sommerfeld intensity: the boundary form of the integral for plane waves at normal
// incidence, and 2-D Gauss–Legendre quadrature for tilted and Gaussian light (test/reference/
// rs2d.ts, which shares nothing with the sums).
//
// Three terms, measured apart and added (each with its own share of the target):
// 1. The kernel's curvature across a box: the sums integrate its phase k·r(u) to second order
//    about the centre, e^{iφ″u²/2} ≈ 1 + iφ″u²/2; with ε = k·h²/(8z) the phase at a cell's edge,
//    the error is about C_CURV·ε². Measured over discs (6λ, 20λ), an annulus (16λ/8λ) and a
//    7.3λ × 4.1λ rectangle, z = 1λ–100λ, windows out to sin θ = 0.85–0.9, grids off the aperture's
//    centre: 0.36–0.59·ε² for ε ≤ 0.2 with h ≤ z/8, and up to 0.85·ε² at h = z/3–z/4 and ε ≥ 0.25.
//    Below ε = 0.15 and with h ≤ z/4 the measured ratio stayed under 0.6 (the 1-D sums: 0.26·ε²).
//    The old rule h ≤ z/8 is not needed: at z = 1λ–5λ the error followed ε alone up to h = z/4.
// 2. Edge cells: the m-node rule of an edge cell errs by about σ^m/(2^{m−1}m!) of the cell, where
//    σ = |s|·h/2 is the linear phase across half a cell, |s| ≤ k(sin θ_max + sin θ_tilt). Over the
//    whole field, measured (m against m = 16 on the same cells, discs of 3λ–30λ and an annulus, z =
//    3λ–100λ, windows to sin θ = 0.5 and 0.9, tilts 0° and 20°, h = λ/4–2λ): at most
//    2.9e-3·σ^m/(2^{m−1}m!) of the peak (e.g. m = 8: 6.5e-8 at σ = 2, 2.3e-6 at σ = 3, 2.3e-4 at
//    σ = 6). C_EDGE = 4e-3 leaves a margin.
// 3. A Gaussian envelope exp(−r²/w²) across a box: the sums integrate its log-slope exactly with
//    the phase slope (a complex argument of the cell's sinc) and its log-curvature −1/w² to second
//    order, so what is left is the third-order term of e^{−u²/w²}: measured 1.0e-3–3.0e-3·(h/w)⁶
//    (discs and annuli whose inner edge sits at 0–3 waists, w = 2λ and 4λ, z = 1000λ, h/w = ⅛–1¼).
//    (Expanding the log-slope to second order as well, the first version erred by (βh)³ terms:
//    2e-3 of the peak at h = w/4 for an annulus whose inner edge was at 3 waists.)
//
// Validation of the whole rule (pitch and nodes from rs2DPitch, grid at a random offset): 60
// random set-ups (discs, annuli, rectangles of 2λ–40λ; z = 2λ–300λ; plane and Gaussian light of
// waist 1.5λ–9.5λ; tilts 0° and 20°; windows out to sin θ = 0.4–0.9) at targets 1e-3 and 1e-4,
// against the references above: worst error 0.71 of the target, 8 of 120 above half of it. A
// fixed selection of such cases is in rs-2d-rule.test.ts.

/** Kernel curvature: error ≈ C_CURV·ε², ε = k·h²/(8z) (measured ≤ 0.6 for ε ≤ 0.15). */
export const RS2D_C_CURV = 0.7;
/** Largest ε the rule uses (the measured law holds to about 0.2). */
export const RS2D_MAX_EPS = 0.15;
/** The box may be at most z/4 wide (measured up to there). */
export const RS2D_MAX_CELL_OVER_Z = 0.25;
/** Edge cells: error ≈ C_EDGE·σ^m/(2^{m−1}m!) (measured ≤ 2.9e-3). */
export const RS2D_C_EDGE = 4e-3;
/** Gaussian envelope: error ≈ C_ENV·(h/w)⁶ (measured ≤ 3.0e-3). */
export const RS2D_C_ENV = 4e-3;
/** The box may be at most one waist wide (measured to 1.25 waists). */
export const RS2D_MAX_CELL_OVER_WAIST = 1;
/** The largest edge-node count the rule picks (an edge pair costs about m² multiply-adds). */
export const RS2D_MAX_EDGE_NODES = 12;

/** Shares of the target given to each term. */
export const RS2D_TARGET_SHARE = { curvature: 0.5, edge: 0.25, envelope: 0.25 } as const;
const SHARE = RS2D_TARGET_SHARE;

function factorial(n: number): number {
  let f = 1;
  for (let i = 2; i <= n; i++) f *= i;
  return f;
}

/** The edge cells' predicted error (fraction of the peak intensity) at σ = |s|·h/2 with m nodes. */
export function rs2DEdgeError(sigma: number, m: number): number {
  return (RS2D_C_EDGE * sigma ** m) / (2 ** (m - 1) * factorial(m));
}

/** The predicted error of the kernel's curvature at pitch h, distance z. */
export function rs2DCurvatureError(pitch: number, wavelength: number, z: number): number {
  const eps = ((2 * Math.PI) / wavelength) * (pitch * pitch) / (8 * z);
  return RS2D_C_CURV * eps * eps;
}

/** The predicted error of a Gaussian envelope of waist w across boxes of side h. */
export function rs2DEnvelopeError(pitch: number, waist: number): number {
  return RS2D_C_ENV * (pitch / waist) ** 6;
}

/**
 * The fewest edge nodes (even, 2 … maxM) whose predicted error at this pitch is within `budget`,
 * or maxM + 2 if none is (slope: sin θ_max + sin θ_tilt, at most 2).
 */
export function rs2DEdgeNodesFor(pitch: number, wavelength: number, slope: number, budget: number, maxM = RS2D_MAX_EDGE_NODES): number {
  const sigma = (Math.PI * pitch * Math.min(2, slope)) / wavelength;
  for (let m = 2; m <= maxM; m += 2) if (rs2DEdgeError(sigma, m) <= budget) return m;
  return maxM + 2;
}

export interface Rs2DPitchOptions {
  /** Gaussian waist (m), if the light is a Gaussian beam. */
  waist?: number;
  /** sin θ of the tilt (the carrier's direction cosine, √(α² + β²)); 0 by default. */
  sinTilt?: number;
  /** false when the aperture has no edge cells (rectangles, slits, gratings: boxes only). Default true. */
  edgeCells?: boolean;
  /** Use this many edge nodes (even, 2–16) instead of choosing. */
  edgeNodes?: number;
  /** The largest node count to choose (default RS2D_MAX_EDGE_NODES). */
  maxEdgeNodes?: number;
}

export interface Rs2DPitch {
  /** Cell pitch (m). */
  pitch: number;
  /** Gauss–Legendre nodes per axis in an edge cell. */
  edgeNodes: number;
  /** Which rule set the pitch. */
  limit: 'curvature' | 'distance' | 'envelope' | 'edge';
  /** Predicted errors (fractions of the peak intensity) at this pitch. */
  predicted: { curvature: number; edge: number; envelope: number; total: number };
}

/**
 * The coarsest pitch (and the edge-node count) for which the predicted error of the exact 2-D sums
 * stays within `target` (a fraction of the peak intensity, e.g. 1e-3), at distance z, with sinMax
 * the largest sine of the angle between a point of the (illuminated) aperture and a point of the
 * window. The target is shared: half to the kernel's curvature, a quarter each to the edge cells
 * and to a Gaussian envelope.
 */
export function rs2DPitch(wavelength: number, z: number, sinMax: number, target: number, opts: Rs2DPitchOptions = {}): Rs2DPitch {
  if (!(wavelength > 0) || !(z > 0)) throw new Error('rs2DPitch: wavelength and distance must be positive');
  if (!(target > 0 && target < 1)) throw new Error('rs2DPitch: the target must be between 0 and 1');
  if (!(sinMax >= 0 && sinMax <= 1)) throw new Error('rs2DPitch: sinMax must be within [0, 1]');
  const k = (2 * Math.PI) / wavelength;
  const eps = Math.min(RS2D_MAX_EPS, Math.sqrt((SHARE.curvature * target) / RS2D_C_CURV));
  let pitch = Math.sqrt((8 * eps * z) / k);
  let limit: Rs2DPitch['limit'] = 'curvature';
  if (pitch > RS2D_MAX_CELL_OVER_Z * z) {
    pitch = RS2D_MAX_CELL_OVER_Z * z;
    limit = 'distance';
  }
  if (opts.waist !== undefined) {
    if (!(opts.waist > 0)) throw new Error('rs2DPitch: the waist must be positive');
    const h = opts.waist * Math.min(RS2D_MAX_CELL_OVER_WAIST, ((SHARE.envelope * target) / RS2D_C_ENV) ** (1 / 6));
    if (h < pitch) {
      pitch = h;
      limit = 'envelope';
    }
  }
  const slope = Math.min(2, sinMax + Math.abs(opts.sinTilt ?? 0));
  const edges = opts.edgeCells ?? true;
  const sigmaAt = (h: number) => (Math.PI * h * slope) / wavelength;
  let m = opts.edgeNodes ?? 0;
  if (edges && opts.edgeNodes === undefined) {
    const maxM = opts.maxEdgeNodes ?? RS2D_MAX_EDGE_NODES;
    const budget = SHARE.edge * target;
    m = rs2DEdgeNodesFor(pitch, wavelength, slope, budget, maxM);
    if (m > maxM) {
      m = maxM;
      // The σ at which maxM nodes meet the budget.
      const sigma = ((budget * 2 ** (m - 1) * factorial(m)) / RS2D_C_EDGE) ** (1 / m);
      pitch = (sigma * wavelength) / (Math.PI * slope);
      limit = 'edge';
    }
  }
  if (m === 0) m = 8;
  const predicted = {
    curvature: rs2DCurvatureError(pitch, wavelength, z),
    edge: edges ? rs2DEdgeError(sigmaAt(pitch), m) : 0,
    envelope: opts.waist !== undefined ? rs2DEnvelopeError(pitch, opts.waist) : 0,
    total: 0,
  };
  predicted.total = predicted.curvature + predicted.edge + predicted.envelope;
  return { pitch, edgeNodes: m, limit, predicted };
}
