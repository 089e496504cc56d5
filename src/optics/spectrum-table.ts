// The far-field formula on any 2-D window through a tabulated spectrum: Â of the area-sampled
// source is computed once on a regular frequency grid that covers the frequencies the window's
// points need, and interpolated at each point's own (x/(λr) − α/λ, y/(λr) − β/λ), instead of a
// Fourier sum over every source sample for every output point (dft2AtPoints in dft.ts).
//
// Why a table interpolates well. T(f) = ΔξΔη Σ U_mn e^{−i2π(fx(ξ_m − ξc) + fy(η_n − ηc))}, the sum
// taken about the centre (ξc, ηc) of the source's non-zero span, is a sum of "tones" in f whose
// "frequencies" ξ_m − ξc lie in [−Rx, Rx] (Rx the span's half-width). Lagrange interpolation of
// order p (p points per axis, centred stencil) on steps h has, for a tone of angular rate ω = 2πξ
// per unit of f, the remainder |e^{iωf} − P(f)| ≤ (ωh)^p/p! · max_s |Π_j (s − t_j)| (the Lagrange
// remainder, e.g. Abramowitz & Stegun 25.2.2 ff.; the product is largest mid-interval, at s = ½, for
// the centred stencil). In 2-D the tensor-product interpolant of a product of tones errs by at most
// εx + εy + εx·εy. Summed over the tones, the error is at most (εx + εy + εxεy)·Σ|U|ΔξΔη, where
// εx is the bound at ωh = 2πRx·hx. Σ|U|ΔξΔη is |Â| at its peak for a real positive source (any
// aperture in a beam with its carrier taken out), so the bound is a fraction of the peak; dividing
// the cell response 1/sinc(fΔ) afterwards multiplies it by at most (π/2)² at the band's corner
// (1.2–1.5 where the planner samples 4 times the window's highest frequency).
//
// Taking the phase about the span's centre halves the tones' reach compared with the origin (and
// more for a span off the axis), which is what lets the steps be 1/(c·R) with c of 10–20.
//
// How the table is computed: separably, rows then columns. Along each axis either
// - 'fft': the axis zero-padded to P (an FFT size: 5-smooth), one FFT giving Â at every k/(PΔ) over the
//   whole period 1/Δ, from which the band's entries are read (wrapping); best when the band covers
//   much of the period; or
// - 'chirp': the chirp-z transform by Bluestein's identity kn = (k² + n² − (k − n)²)/2: Â at any K
//   frequencies fa + k·h as a convolution with the chirp e^{iπθj²} (θ = hΔ), done by FFTs of the
//   next FFT size L ≥ n + K − 1 (two per row, and one for the chirp, shared by all rows); best
//   for a narrow band (Rabiner, Schafer & Rader, IEEE Trans. Audio Electroacoust. 17, 86 (1969);
//   the arbitrary-window use of it in diffraction: Hu et al., Light Sci. Appl. 9, 119 (2020)).
// The mode of each axis is the one with the smaller total work (the planner's units, below).
// The FFTs are the engine's row pass (engine.fftRows: fft-fast.ts transformRows, in this thread), run on
// blocks of rows; rows of the source that are all zero are skipped, and columns of the transform
// that no table entry needs are never transformed.
import { axisAt, createField, isOneD, multiplyComplex, type Axis, type Field } from './field.js';
import { nextFastFftSize } from './fft.js';
import type { Engine } from './engine.js';
import { cellResponse } from './spectral.js';
import { applyFarFieldFactor } from './direct.js';

/** The frequencies (1/m, carrier already taken off) the table must cover. */
export interface SpectrumBand {
  fx: [number, number];
  fy: [number, number];
}

/** Points per axis of the interpolation stencil. */
export type TableOrder = 4 | 6 | 8;

export type AxisMode = 'fft' | 'chirp';

export interface SpectrumTableOptions {
  /**
   * Lagrange interpolation points per axis (default 8: for the same accuracy its table has about
   * (11/18)² of the entries of order 6 and takes a fifth of the transform time; per point it was
   * measured as fast, the smaller table staying in cache).
   */
  order?: TableOrder;
  /**
   * Bound on the interpolation error as a fraction of Σ|U|ΔξΔη (the peak of |Â| for a real positive
   * source), before the cell-response division; split equally between the axes. Default 2e-5.
   */
  accuracy?: number;
  /** Table steps (1/m) instead of those the accuracy asks for (for studies and tests). */
  step?: [number, number];
  /** Transform per axis instead of the cheaper one (for tests). */
  mode?: [AxisMode, AxisMode];
  /**
   * Divide the cell response sinc(fxΔξ)·sinc(fyΔη) out when interpolating (default true, as
   * propagateFarField does). That convention is exact only for a blurred-then-sampled source; the
   * tests measure what it does elsewhere: a point-sampled smooth envelope (a Gaussian beam) gains
   * 1/sinc per axis (its power Δ²/(6w²)), and a mask whose edges lie on cell boundaries, whose sum is
   * exactly Â/sinc per axis, is left off by sinc² ((πfΔ)²/3 relative at f). Both are small against
   * the peak at the planner's pitches, not against the local intensity far out in the wings.
   */
  divideCellResponse?: boolean;
}

export interface SpectrumTable2D {
  order: TableOrder;
  /** Frequency of entry [0][0] and the steps (1/m). */
  fx0: number;
  fy0: number;
  hx: number;
  hy: number;
  /** Entries along fx (row length) and fy (rows). */
  nx: number;
  ny: number;
  /** T(fx, fy) about the centre, interleaved complex, row-major [fy][fx]. */
  values: Float64Array;
  /** (ξc, ηc): Â(f) = T(f)·e^{−i2π(fx ξc + fy ηc)}. */
  centre: [number, number];
  /** Source pitch, for the cell response. */
  pitch: [number, number];
  divideCellResponse: boolean;
  /** Half-widths of the source's non-zero span about the centre (m). */
  halfWidth: [number, number];
  /** Σ|U|ΔξΔη. */
  sumAbs: number;
  /** Interpolation error bound as a fraction of sumAbs (before the cell-response division). */
  errorBound: number;
  mode: [AxisMode, AxisMode];
}

// ---- the error law -------------------------------------------------------------------------------

function factorial(n: number): number {
  let f = 1;
  for (let i = 2; i <= n; i++) f *= i;
  return f;
}

/** max over s ∈ [0, 1] of |Π_j (s − t_j)| for the centred stencil t_j = −p/2 + 1 … p/2: at s = ½. */
function stencilProduct(p: number): number {
  let prod = 1;
  for (let j = 0; j < p; j++) prod *= Math.abs(0.5 - (j - (p / 2 - 1)));
  return prod;
}

/**
 * Bound on |e^{iωf} − P(f)| for order-p Lagrange interpolation on steps h, with ωh = phaseStep
 * (rad per entry): phaseStep^p/p! · max|Π(s − t_j)|. For a table this is ε of one axis with
 * phaseStep = 2π·R·h, R the source's half-width about the table's centre.
 */
export function interpolationErrorPerAxis(order: TableOrder, phaseStep: number): number {
  return (phaseStep ** order / factorial(order)) * stencilProduct(order);
}

/**
 * The table's error bound as a fraction of Σ|U|ΔξΔη for steps (hx, hy) and half-widths (Rx, Ry):
 * εx + εy + εx·εy. Multiply by 1/(sinc(fxΔξ)·sinc(fyΔη)) for the error in Â at (fx, fy).
 */
export function spectrumTableError(order: TableOrder, step: [number, number], halfWidth: [number, number]): number {
  const ex = interpolationErrorPerAxis(order, 2 * Math.PI * halfWidth[0] * step[0]);
  const ey = interpolationErrorPerAxis(order, 2 * Math.PI * halfWidth[1] * step[1]);
  return ex + ey + ex * ey;
}

/** The largest step (1/m) for which one axis of half-width R errs by at most eps (per axis). */
export function tableStepFor(order: TableOrder, eps: number, halfWidth: number): number {
  const phase = Math.pow((eps * factorial(order)) / stencilProduct(order), 1 / order);
  return phase / (2 * Math.PI * halfWidth);
}

// ---- planning an axis ----------------------------------------------------------------------------

/** One axis of the table: how its entries come from the n source samples along it. */
export interface AxisTransform {
  mode: AxisMode;
  /** Source samples along the axis (the non-zero span). */
  n: number;
  pitch: number;
  /** Frequency of entry 0, step and number of entries K. */
  start: number;
  step: number;
  count: number;
  /** FFT length: P ('fft') or L ('chirp'). */
  size: number;
  /** 'fft': the DFT index of entry 0 (entry k is bin (first + k) mod P). */
  first: number;
}

/** Entries beyond each end of the band: the stencil reaches p/2 − 1 below and p/2 above, plus one. */
function margin(order: TableOrder): number {
  return order / 2 + 1;
}

export function planAxis(n: number, pitch: number, lo: number, hi: number, order: TableOrder, targetStep: number, mode: AxisMode): AxisTransform {
  if (!(hi >= lo)) throw new Error(`spectrum table: empty band [${lo}, ${hi}]`);
  const edge = margin(order);
  if (mode === 'chirp') {
    const step = targetStep;
    const start = lo - edge * step;
    const count = Math.ceil((hi - lo) / step) + 2 * edge + 1;
    return { mode, n, pitch, start, step, count, size: nextFastFftSize(n + count - 1), first: 0 };
  }
  // Any FFT size: entries are bins (first + k) mod size, at most targetStep apart.
  const size = nextFastFftSize(Math.max(n, Math.ceil(1 / (pitch * targetStep))));
  const step = 1 / (size * pitch);
  const first = Math.floor(lo / step) - edge;
  const last = Math.ceil(hi / step) + edge;
  return { mode, n, pitch, start: first * step, step, count: last - first + 1, size, first };
}

/** Work (planner units: 10·N·log₂N per N-point FFT, 8 per complex multiply-add) of one transformed row. */
function rowWork(a: AxisTransform): number {
  const fft = 10 * a.size * Math.log2(a.size);
  return a.mode === 'fft' ? fft + 8 * (a.n + a.count) : 2 * fft + 8 * (a.n + a.size + a.count);
}

/** Work that does not depend on the rows: the chirp's own FFT and the phase tables. */
function axisSetupWork(a: AxisTransform): number {
  return a.mode === 'chirp' ? 10 * a.size * Math.log2(a.size) + 100 * (a.n + a.size + a.count) : 100 * a.count;
}

/** Complex values of one block of rows: at most 2^17 (2 MB), at least one row. */
const BLOCK_VALUES = 1 << 17;

function blockRows(size: number, rows: number): number {
  let b = 1;
  while (2 * b * size <= BLOCK_VALUES && 2 * b <= rows) b *= 2;
  return b;
}

/** Source shape for the estimates: samples in the non-zero span and pitch along each axis. */
export interface SourceShape {
  nx: number;
  ny: number;
  dx: number;
  dy: number;
}

export interface TablePlan {
  order: TableOrder;
  x: AxisTransform;
  y: AxisTransform;
  halfWidth: [number, number];
  errorBound: number;
  /** Work of the transforms (planner units). */
  work: number;
  /** Bytes held while tabulating: the table, the row pass's result, blocks (and the FFT kernel's copy of one), phase tables. */
  memory: number;
}

function tableMemory(x: AxisTransform, y: AxisTransform, rows: number): number {
  const phaseTables = 16 * (2 * (x.n + x.count + x.size) + 2 * (y.n + y.count + y.size)) + 4 * (x.count + y.count);
  const blockX = blockRows(x.size, rows) * x.size;
  const blockY = blockRows(y.size, x.count) * y.size;
  return 16 * (x.count * y.count + rows * x.count + 2 * Math.max(blockX, blockY)) + phaseTables;
}

/** The cheaper of the transforms per axis (or those asked for), with the steps the accuracy asks for. */
export function planSpectrumTable(shape: SourceShape, band: SpectrumBand, opts: SpectrumTableOptions = {}): TablePlan {
  const order = opts.order ?? 8;
  if (![4, 6, 8].includes(order)) throw new Error(`spectrum table: order ${order} is not 4, 6 or 8`);
  const accuracy = opts.accuracy ?? 2e-5;
  // The half-widths about the span's centre; a single sample is exact at any step (a constant).
  const halfWidth: [number, number] = [Math.max((shape.nx - 1) / 2, 0.5) * shape.dx, Math.max((shape.ny - 1) / 2, 0.5) * shape.dy];
  const target: [number, number] = opts.step ?? [tableStepFor(order, accuracy / 2, halfWidth[0]), tableStepFor(order, accuracy / 2, halfWidth[1])];
  const modes: AxisMode[] = ['fft', 'chirp'];
  let best: TablePlan | null = null;
  for (const mx of opts.mode ? [opts.mode[0]] : modes) {
    for (const my of opts.mode ? [opts.mode[1]] : modes) {
      const x = planAxis(shape.nx, shape.dx, band.fx[0], band.fx[1], order, target[0], mx);
      const y = planAxis(shape.ny, shape.dy, band.fy[0], band.fy[1], order, target[1], my);
      const work = shape.ny * rowWork(x) + x.count * rowWork(y) + axisSetupWork(x) + axisSetupWork(y);
      const memory = tableMemory(x, y, shape.ny);
      if (!best || work < best.work || (work === best.work && memory < best.memory)) {
        best = { order, x, y, halfWidth, errorBound: spectrumTableError(order, [x.step, y.step], halfWidth), work, memory };
      }
    }
  }
  return best!;
}

// ---- the transforms ------------------------------------------------------------------------------

/** e^{iπ·t} for t given as a real number of half-turns, reduced first (keeps large phases exact). */
function halfTurns(t: number, out: Float64Array, i: number, scale: number): void {
  const r = t - 2 * Math.floor(t / 2);
  out[2 * i] = scale * Math.cos(Math.PI * r);
  out[2 * i + 1] = scale * Math.sin(Math.PI * r);
}

/** The per-axis tables of one transform: input factors, the chirp's spectrum, output positions and factors. */
interface AxisKit {
  a: AxisTransform;
  /** 'chirp': e^{−iπ(φa(2m − (n−1)) + θm²)} per input sample; null for 'fft'. */
  pre: Float64Array | null;
  /** 'chirp': FFT of the chirp e^{iπθj²} laid out circularly; null for 'fft'. */
  kernel: Float64Array | null;
  /** Where entry k sits in a transformed row. */
  at: Int32Array;
  /** Entry k's factor (centring phase, chirp, pitch). */
  post: Float64Array;
}

function axisKit(engine: Engine, a: AxisTransform): AxisKit {
  const { n, count: K, size, pitch } = a;
  const at = new Int32Array(K);
  const post = new Float64Array(2 * K);
  if (a.mode === 'fft') {
    // Σ_m x_m e^{−i2π j(m − mc)/P} = e^{iπ j(n−1)/P}·DFT_j(x), j = first + k; j(n−1) is an exact integer.
    for (let k = 0; k < K; k++) {
      const j = a.first + k;
      at[k] = (((j % size) + size) % size);
      const q = (j * (n - 1)) % (2 * size);
      halfTurns(q / size, post, k, pitch);
    }
    return { a, pre: null, kernel: null, at, post };
  }
  // Σ_m x_m e^{−i2π(fa + kh)(m − mc)Δ} = e^{iπθ(k(n−1) − k²)} Σ_m [x_m e^{−iπ(φa(2m−(n−1)) + θm²)}] e^{iπθ(k−m)²},
  // θ = hΔ, φa = fa·Δ, by km = (k² + m² − (k − m)²)/2.
  const theta = a.step * pitch;
  const phiA = a.start * pitch;
  const pre = new Float64Array(2 * n);
  for (let m = 0; m < n; m++) halfTurns(-(phiA * (2 * m - (n - 1)) + theta * m * m), pre, m, 1);
  const kernel = new Float64Array(2 * size);
  for (let j = -(n - 1); j < K; j++) halfTurns(theta * j * j, kernel, (j + size) % size, 1);
  engine.fftRows(kernel, kernel, size, 1, 0, 1, false);
  for (let k = 0; k < K; k++) {
    at[k] = k;
    halfTurns(theta * (k * (n - 1) - k * k), post, k, pitch);
  }
  return { a, pre, kernel, at, post };
}

/**
 * Transforms `rows` rows of a block (each `size` long, the n inputs at the start, zeros after) in
 * place: pre-factors, forward FFTs, and for 'chirp' the product with the chirp's spectrum and the
 * inverse FFTs. Entry k of row b is then post[k]·block[b][at[k]].
 */
function transformBlock(engine: Engine, kit: AxisKit, block: Float64Array, rows: number): void {
  const { a, pre, kernel } = kit;
  const L = a.size;
  if (pre) for (let b = 0; b < rows; b++) multiplyComplex(block, b * L, pre, a.n);
  engine.fftRows(block, block, L, rows, 0, rows, false);
  if (!kernel) return;
  for (let b = 0; b < rows; b++) multiplyComplex(block, b * L, kernel, L);
  engine.fftRows(block, block, L, rows, 0, rows, true);
}

/** Power-of-two groups of rows from `total`, each at most `most` (equal blocks while they fit; any count would do). */
function* rowGroups(total: number, most: number): Generator<[number, number]> {
  let r = 0;
  while (r < total) {
    let b = most;
    while (b > total - r) b /= 2;
    yield [r, b];
    r += b;
  }
}

/** The source's non-zero span: first and last non-zero column and row (an all-zero source: [0,0,0,0]). */
function nonZeroBox(src: Field): [number, number, number, number] {
  let c0 = src.nx;
  let c1 = -1;
  let r0 = src.ny;
  let r1 = -1;
  const d = src.data;
  for (let r = 0; r < src.ny; r++) {
    const o = 2 * r * src.nx;
    for (let c = 0; c < src.nx; c++) {
      if (d[o + 2 * c] !== 0 || d[o + 2 * c + 1] !== 0) {
        if (c < c0) c0 = c;
        if (c > c1) c1 = c;
        if (r < r0) r0 = r;
        r1 = r;
      }
    }
  }
  return c1 < 0 ? [0, 0, 0, 0] : [c0, c1, r0, r1];
}

/**
 * Â of an area-sampled 2-D source (Â(f) = Σ U e^{−i2πf·ξ} ΔξΔη, the sum dft2 and dft2AtPoints
 * evaluate) on a regular grid over `band` (frequencies with the carrier already taken off, as
 * propagateFarField evaluates them), with steps fine enough that interpolateSpectrum2D is within
 * `errorBound`·Σ|U|ΔξΔη of the sum (see the head of this file).
 */
export function tabulateSpectrum2D(engine: Engine, src: Field, band: SpectrumBand, opts: SpectrumTableOptions = {}): SpectrumTable2D {
  if (isOneD(src)) throw new Error('tabulateSpectrum2D needs a 2-D source');
  const span = sourceSpan(src);
  return tabulateWithPlan(engine, src, span, planSpectrumTable(span.shape, band, opts), opts.divideCellResponse ?? true);
}

/** The non-zero span of a source, its shape for the plans, and Σ|U|ΔξΔη. */
interface SourceSpan {
  box: [number, number, number, number];
  shape: SourceShape;
  sumAbs: number;
}

function sourceSpan(src: Field): SourceSpan {
  const box = nonZeroBox(src);
  const [c0, c1, r0, r1] = box;
  const d = src.data;
  let sumAbs = 0;
  for (let r = r0; r <= r1; r++) {
    for (let c = c0; c <= c1; c++) sumAbs += Math.hypot(d[2 * (r * src.nx + c)]!, d[2 * (r * src.nx + c) + 1]!);
  }
  return { box, shape: { nx: c1 - c0 + 1, ny: r1 - r0 + 1, dx: src.dx, dy: src.dy }, sumAbs: sumAbs * src.dx * src.dy };
}

function tabulateWithPlan(engine: Engine, src: Field, span: SourceSpan, plan: TablePlan, divideCell: boolean): SpectrumTable2D {
  const [c0, c1, r0, r1] = span.box;
  const shape = span.shape;
  const kx = axisKit(engine, plan.x);
  const ky = axisKit(engine, plan.y);
  const X = plan.x;
  const Y = plan.y;
  const d = src.data;

  // Rows: mid[r][k] = entry k of source row r0 + r along fx.
  const rows = shape.ny;
  const mid = new Float64Array(2 * rows * X.count);
  const mostX = blockRows(X.size, rows);
  const blockX = new Float64Array(2 * mostX * X.size);
  for (const [g0, g] of rowGroups(rows, mostX)) {
    const block = blockX.subarray(0, 2 * g * X.size);
    block.fill(0);
    for (let b = 0; b < g; b++) {
      const from = 2 * ((r0 + g0 + b) * src.nx + c0);
      block.set(d.subarray(from, from + 2 * shape.nx), 2 * b * X.size);
    }
    transformBlock(engine, kx, block, g);
    for (let b = 0; b < g; b++) {
      const o = 2 * b * X.size;
      const w = 2 * (g0 + b) * X.count;
      for (let k = 0; k < X.count; k++) {
        const i = o + 2 * kx.at[k]!;
        const re = block[i]!;
        const im = block[i + 1]!;
        const pr = kx.post[2 * k]!;
        const pi = kx.post[2 * k + 1]!;
        mid[w + 2 * k] = re * pr - im * pi;
        mid[w + 2 * k + 1] = re * pi + im * pr;
      }
    }
  }

  // Columns of mid (one per fx entry) along fy, into the table [fy][fx].
  const values = new Float64Array(2 * X.count * Y.count);
  const mostY = blockRows(Y.size, X.count);
  const blockY = new Float64Array(2 * mostY * Y.size);
  for (const [g0, g] of rowGroups(X.count, mostY)) {
    const block = blockY.subarray(0, 2 * g * Y.size);
    block.fill(0);
    for (let b = 0; b < g; b++) {
      const o = 2 * b * Y.size;
      for (let m = 0; m < rows; m++) {
        block[o + 2 * m] = mid[2 * (m * X.count + g0 + b)]!;
        block[o + 2 * m + 1] = mid[2 * (m * X.count + g0 + b) + 1]!;
      }
    }
    transformBlock(engine, ky, block, g);
    for (let b = 0; b < g; b++) {
      const o = 2 * b * Y.size;
      for (let k = 0; k < Y.count; k++) {
        const i = o + 2 * ky.at[k]!;
        const re = block[i]!;
        const im = block[i + 1]!;
        const pr = ky.post[2 * k]!;
        const pi = ky.post[2 * k + 1]!;
        const w = 2 * (k * X.count + g0 + b);
        values[w] = re * pr - im * pi;
        values[w + 1] = re * pi + im * pr;
      }
    }
  }
  return {
    order: plan.order,
    fx0: X.start,
    fy0: Y.start,
    hx: X.step,
    hy: Y.step,
    nx: X.count,
    ny: Y.count,
    values,
    centre: [src.x0 + ((c0 + c1) / 2) * src.dx, src.y0 + ((r0 + r1) / 2) * src.dy],
    pitch: [src.dx, src.dy],
    divideCellResponse: divideCell,
    halfWidth: plan.halfWidth,
    sumAbs: span.sumAbs,
    errorBound: plan.errorBound,
    mode: [X.mode, Y.mode],
  };
}

// ---- interpolation -------------------------------------------------------------------------------

/** 1/Π_{l≠j}(t_j − t_l) for the centred stencils of 4, 6 and 8 points. */
const INVERSE_DENOMINATORS: Record<number, Float64Array> = {};
for (const p of [4, 6, 8]) {
  const inv = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let den = 1;
    for (let l = 0; l < p; l++) if (l !== j) den *= j - l;
    inv[j] = 1 / den;
  }
  INVERSE_DENOMINATORS[p] = inv;
}

// Scratch for one interpolation (written before it is read in each call): not state between calls.
const wx = new Float64Array(8);
const wy = new Float64Array(8);
const fwd = new Float64Array(9);

/** Lagrange weights at s ∈ [0, 1) for nodes t_j = j − (p/2 − 1), by prefix and suffix products. */
function weights(p: number, s: number, w: Float64Array): void {
  const inv = INVERSE_DENOMINATORS[p]!;
  const off = p / 2 - 1;
  fwd[0] = 1;
  for (let j = 0; j < p; j++) fwd[j + 1] = fwd[j]! * (s - (j - off));
  let back = 1;
  for (let j = p - 1; j >= 0; j--) {
    w[j] = fwd[j]! * back * inv[j]!;
    back *= s - (j - off);
  }
}

/**
 * Â(fx, fy) from the table into out[2i], out[2i+1]: the order-p tensor Lagrange interpolant of T,
 * times e^{−i2π(fx ξc + fy ηc)}, divided by the cell response when the table says so. Allocation-
 * free. Frequencies outside the tabulated band are extrapolated from the nearest stencil (the error
 * bound then does not hold; farFieldByTable never asks for them).
 */
export function interpolateSpectrum2D(t: SpectrumTable2D, fx: number, fy: number, out: Float64Array, i: number): void {
  const p = t.order;
  const h = p / 2;
  const px = (fx - t.fx0) / t.hx;
  const py = (fy - t.fy0) / t.hy;
  const kx = Math.min(Math.max(h - 1, Math.floor(px)), t.nx - h - 1);
  const ky = Math.min(Math.max(h - 1, Math.floor(py)), t.ny - h - 1);
  weights(p, px - kx, wx);
  weights(p, py - ky, wy);
  const v = t.values;
  const n = t.nx;
  let sr = 0;
  let si = 0;
  for (let b = 0; b < p; b++) {
    let o = 2 * ((ky - h + 1 + b) * n + kx - h + 1);
    let rr = 0;
    let ri = 0;
    for (let a = 0; a < p; a++, o += 2) {
      const w = wx[a]!;
      rr += w * v[o]!;
      ri += w * v[o + 1]!;
    }
    const w = wy[b]!;
    sr += w * rr;
    si += w * ri;
  }
  let g = 1;
  if (t.divideCellResponse) g = 1 / (cellResponse(fx, t.pitch[0]) * cellResponse(fy, t.pitch[1]));
  const ph = -2 * Math.PI * (fx * t.centre[0] + fy * t.centre[1]);
  const c = g * Math.cos(ph);
  const s = g * Math.sin(ph);
  out[2 * i] = sr * c - si * s;
  out[2 * i + 1] = sr * s + si * c;
}

// ---- the far field -------------------------------------------------------------------------------

/**
 * The frequencies (x/(λr) − α/λ, y/(λr) − β/λ) over a window: fx grows with x and |fx| falls with
 * |y|, so the extremes over the box sit at x at its ends and y at its ends or nearest 0 (and
 * likewise for fy): exact for the box, so a band for any sample inside it.
 */
export function farFieldBand(outX: Axis, outY: Axis, z: number, wavelength: number, carrier: [number, number]): SpectrumBand {
  const xs = [axisAt(outX, 0), axisAt(outX, outX.n - 1)];
  const ys = [axisAt(outY, 0), axisAt(outY, outY.n - 1)];
  const near = (v: number[]) => (Math.min(v[0]!, v[1]!) <= 0 && Math.max(v[0]!, v[1]!) >= 0 ? 0 : Math.abs(v[0]!) < Math.abs(v[1]!) ? v[0]! : v[1]!);
  const band: SpectrumBand = { fx: [Infinity, -Infinity], fy: [Infinity, -Infinity] };
  for (const x of [...xs, near(xs)]) {
    for (const y of [...ys, near(ys)]) {
      const r = Math.sqrt(x * x + y * y + z * z);
      const fx = x / (wavelength * r) - carrier[0];
      const fy = y / (wavelength * r) - carrier[1];
      band.fx = [Math.min(band.fx[0], fx), Math.max(band.fx[1], fx)];
      band.fy = [Math.min(band.fy[0], fy), Math.max(band.fy[1], fy)];
    }
  }
  return band;
}

export interface FarFieldTableOptions extends SpectrumTableOptions {
  /**
   * Bytes the tabulation may hold at once (default 512 MiB). Beyond it the band is cut into
   * bx × by equal tiles, each tabulated and interpolated at its own points in turn: the same
   * accuracy, more transform work (each tile's transforms are at least as long as the source).
   */
  maxMemory?: number;
}

const DEFAULT_MAX_MEMORY = 512 * 2 ** 20;

/** Tile (i, j) of `band` cut into tiles[0] × tiles[1] equal parts. */
function bandTile(band: SpectrumBand, tiles: [number, number], i: number, j: number): SpectrumBand {
  const wx = (band.fx[1] - band.fx[0]) / tiles[0];
  const wy = (band.fy[1] - band.fy[0]) / tiles[1];
  return {
    fx: [band.fx[0] + i * wx, i === tiles[0] - 1 ? band.fx[1] : band.fx[0] + (i + 1) * wx],
    fy: [band.fy[0] + j * wy, j === tiles[1] - 1 ? band.fy[1] : band.fy[0] + (j + 1) * wy],
  };
}

export interface TableTiling {
  tiles: [number, number];
  /** The plan of every tile, row-major [j][i]. */
  plans: TablePlan[];
  /** Transforms of all tiles (planner units). */
  work: number;
  /** The largest tile's bytes. */
  memory: number;
}

/** Most tiles before the tabulation gives up (the source alone would then not fit). */
const MAX_TILES = 1 << 14;

/**
 * Tiles for a memory limit: the whole band when it fits, else the axis whose entries cost most
 * (fx while the row pass's Ny × Kx or Kx ≥ Ky dominates, else fy) halved until the largest tile fits.
 */
export function planTableTiles(shape: SourceShape, band: SpectrumBand, opts: FarFieldTableOptions = {}): TableTiling {
  const t = findTableTiles(shape, band, opts);
  if ('error' in t) throw new Error(t.error);
  return t;
}

/** planTableTiles, or why no tiling fits (for costing, which must refuse, not throw). */
function findTableTiles(shape: SourceShape, band: SpectrumBand, opts: FarFieldTableOptions): TableTiling | { error: string } {
  const limit = opts.maxMemory ?? DEFAULT_MAX_MEMORY;
  const tiles: [number, number] = [1, 1];
  for (;;) {
    const plans: TablePlan[] = [];
    for (let j = 0; j < tiles[1]; j++) for (let i = 0; i < tiles[0]; i++) plans.push(planSpectrumTable(shape, bandTile(band, tiles, i, j), opts));
    const worst = plans.reduce((a, b) => (b.memory > a.memory ? b : a));
    const work = plans.reduce((s, p) => s + p.work, 0);
    if (worst.memory <= limit) return { tiles: [tiles[0], tiles[1]], plans, work, memory: worst.memory };
    if (tiles[0] * tiles[1] >= MAX_TILES) {
      return { error: `spectrum table: even as ${tiles[0]} × ${tiles[1]} tiles a tile needs ${(worst.memory / 2 ** 20).toFixed(0)} MiB (limit ${(limit / 2 ** 20).toFixed(0)} MiB)` };
    }
    if (worst.x.count >= worst.y.count || worst.y.count <= shape.ny) tiles[0] *= 2;
    else tiles[1] *= 2;
  }
}

/** Work per output point besides the stencil (4 per tap, 8 per row of it): frequencies, phase, cell response, kernel factor. */
const POINT_OVERHEAD = 200;

function pointWork(order: number): number {
  return 4 * order * order + 8 * order + POINT_OVERHEAD;
}

/**
 * What propagateFarField (direct.ts) computes for a 2-D source — U(x,y) = prefactor(r)·Â(x/(λr) −
 * α/λ, y/(λr) − β/λ) with the exact kernel factor (applyFarFieldFactor) — with Â from tables over
 * the window's band instead of a sum per point. carrier = [α/λ, β/λ].
 */
export function farFieldByTable(
  engine: Engine,
  src: Field,
  z: number,
  outX: Axis,
  outY: Axis,
  carrier: [number, number],
  opts: FarFieldTableOptions = {},
): Field {
  const lam = src.wavelength;
  const band = farFieldBand(outX, outY, z, lam, carrier);
  if (isOneD(src)) throw new Error('farFieldByTable needs a 2-D source');
  const span = sourceSpan(src);
  const tiling = planTableTiles(span.shape, band, opts);
  const divide = opts.divideCellResponse ?? true;
  const out = createField(outX, outY, lam);
  const nx = outX.n;
  const m = outX.n * outY.n;
  const [bx, by] = tiling.tiles;
  if (bx * by === 1) {
    const table = tabulateWithPlan(engine, src, span, tiling.plans[0]!, divide);
    for (let r = 0; r < outY.n; r++) {
      const y = axisAt(outY, r);
      for (let c = 0; c < nx; c++) {
        const x = axisAt(outX, c);
        const rr = Math.sqrt(x * x + y * y + z * z);
        interpolateSpectrum2D(table, x / (lam * rr) - carrier[0], y / (lam * rr) - carrier[1], out.data, r * nx + c);
      }
    }
  } else {
    // Each point to its tile (by its frequencies), then the points grouped by tile (a counting sort).
    const sx = band.fx[1] > band.fx[0] ? bx / (band.fx[1] - band.fx[0]) : 0;
    const sy = band.fy[1] > band.fy[0] ? by / (band.fy[1] - band.fy[0]) : 0;
    const tileOf = new Int32Array(m);
    const first = new Int32Array(bx * by + 1);
    for (let r = 0; r < outY.n; r++) {
      const y = axisAt(outY, r);
      for (let c = 0; c < nx; c++) {
        const x = axisAt(outX, c);
        const rr = Math.sqrt(x * x + y * y + z * z);
        const i = Math.min(bx - 1, Math.max(0, Math.floor((x / (lam * rr) - carrier[0] - band.fx[0]) * sx)));
        const j = Math.min(by - 1, Math.max(0, Math.floor((y / (lam * rr) - carrier[1] - band.fy[0]) * sy)));
        tileOf[r * nx + c] = j * bx + i;
        first[j * bx + i + 1]!++;
      }
    }
    for (let t = 0; t < bx * by; t++) first[t + 1]! += first[t]!;
    const next = first.slice(0, bx * by);
    const points = new Int32Array(m);
    for (let p = 0; p < m; p++) points[next[tileOf[p]!]!++] = p;
    for (let t = 0; t < bx * by; t++) {
      if (first[t + 1] === first[t]) continue;
      const table = tabulateWithPlan(engine, src, span, tiling.plans[t]!, divide);
      for (let q = first[t]!; q < first[t + 1]!; q++) {
        const p = points[q]!;
        const x = axisAt(outX, p % nx);
        const y = axisAt(outY, Math.floor(p / nx));
        const rr = Math.sqrt(x * x + y * y + z * z);
        interpolateSpectrum2D(table, x / (lam * rr) - carrier[0], y / (lam * rr) - carrier[1], out.data, p);
      }
    }
  }
  applyFarFieldFactor(out, z);
  return out;
}

// ---- estimates -----------------------------------------------------------------------------------

export interface FarFieldTableCost {
  /** Planner units: 10·N·log₂N per N-point FFT, 8 per complex multiply-add (2e8 ≈ 1 s of one core). */
  work: number;
  /** Peak bytes of farFieldByTable: the largest tile's tabulation, the output field and, when tiled, the point index. */
  memory: number;
  /** Tiles of the band (1 × 1 unless the memory limit cuts it). */
  tiles: [number, number];
  /** Table entries along fx, fy of the largest tile, and the transform of each axis. */
  entries: [number, number];
  mode: [AxisMode, AxisMode];
  /** Interpolation error bound as a fraction of Σ|U|ΔξΔη (times 1/(sinc(fxΔξ)·sinc(fyΔη)) at a point). */
  errorBound: number;
}

/**
 * The cost of farFieldByTable for a source of this shape (the non-zero span: samples and pitch per
 * axis), a band (farFieldBand of the window) and `outputs` points.
 */
export function costFarFieldTable(srcShape: SourceShape, band: SpectrumBand, outputs: number, opts: FarFieldTableOptions = {}): FarFieldTableCost {
  const found = findTableTiles(srcShape, band, opts);
  // No tiling fits: a size no machine holds, which the planner refuses with its reasons.
  if ('error' in found) return { work: Infinity, memory: Infinity, tiles: [0, 0], entries: [0, 0], mode: ['fft', 'fft'], errorBound: 0 };
  const tiling = found;
  const tiled = tiling.tiles[0] * tiling.tiles[1] > 1;
  const worst = tiling.plans.reduce((a, b) => (b.memory > a.memory ? b : a));
  const order = worst.order;
  return {
    work: tiling.work + outputs * (pointWork(order) + (tiled ? 40 : 0)) + 8 * srcShape.nx * srcShape.ny,
    memory: tiling.memory + 16 * outputs + (tiled ? 8 * outputs : 0),
    tiles: tiling.tiles,
    entries: [worst.x.count, worst.y.count],
    mode: [worst.x.mode, worst.y.mode],
    errorBound: tiling.plans.reduce((e, p) => Math.max(e, p.errorBound), 0),
  };
}
