// Memory and work estimates of the propagations on FFT grids and by direct sums, as the planner
// compares them (calibrated by npm run bench at LIMITS.workPerSecond).
import type { AxisPlan, Layout } from './types.js';

/** What a case holds whatever it computes (the program, its modules, the heap's slack). */
export const BASELINE_MEMORY = 64 * 1024 ** 2;

export function costFft(axes: AxisPlan[], layout: Layout): { memory: number; work: number } {
  const n = axes.reduce((p, a) => p * a.inputSamples, 1);
  const np = axes.reduce((p, a) => p * a.paddedSamples, 1);
  const m = axes.reduce((p, a) => p * a.output.n, 1);
  // Per axis, tables as long as the padded axis: the transfer's frequencies, cell factors,
  // multipliers and phases (spectral.ts multiplyTransfer), the source's mask and envelope and the
  // FFT's own tables: about 112 bytes a sample, measured on a 1-D grid of 2²⁰ (where they are most
  // of the memory; on a 2-D grid they are nothing beside it).
  const tables = axes.reduce((s, a) => s + 112 * a.paddedSamples, 0);
  if (layout === 'separable') {
    // Two 1-D problems (source, padded grid and the kernel's copy, output), then the 2-D product on the output window.
    const oneD = axes.reduce((s, a) => s + 16 * (a.inputSamples + 2 * a.paddedSamples + a.output.n), 0);
    return { memory: BASELINE_MEMORY + oneD + tables + 64 * m, work: axes.reduce((s, a) => s + 3.3 * a.paddedSamples * Math.log2(a.paddedSamples), 0) + 20 * m };
  }
  // Source, padded grid, the FFT kernel's working copy of it (kept between calls), output arrays.
  // Work: two FFTs and the transfer multiply; the SIMD kernel runs a 4096² case (pad of 2048²) in
  // about 1.1 s, about 3.3·N·log₂N + 10·N at LIMITS.workPerSecond's calibration (npm run bench).
  // Grids that are not powers of two (5-smooth: radix-3 and radix-5 stages) cost about the same
  // per N·log₂N: measured one-thread 2-D transforms of 1000², 1080², 1125², 1152² and 1200² took
  // 0.8–1.2× the time per N·log₂N of 1024² and 2048² (the spread of the shared machine's noise).
  return { memory: BASELINE_MEMORY + 16 * n + 32 * np + tables + 64 * m, work: 3.3 * np * Math.log2(np) + 10 * np };
}

/**
 * The single-FFT Fresnel form: as costFft, but on a 2-D grid it holds three padded arrays besides
 * the kernel's working copy: the padded source, its chirped copy that is transformed, and the whole
 * output lattice the window is cut from (single-fft.ts).
 */
export function costSingleFft(axes: AxisPlan[], layout: Layout): { memory: number; work: number } {
  const base = costFft(axes, layout);
  if (layout !== 'two-d') return base;
  const np = axes.reduce((p, a) => p * a.paddedSamples, 1);
  return { memory: base.memory + 32 * np, work: base.work };
}

export function costDirect(axes: AxisPlan[], layout: Layout, farField: boolean): { memory: number; work: number } {
  const m = axes.reduce((p, a) => p * a.output.n, 1);
  if (layout !== 'two-d') {
    const mem = axes.reduce((s, a) => s + 16 * (2 * a.inputSamples + 2 * a.output.n), 0);
    const work = axes.reduce((s, a) => s + 8 * a.inputSamples * (farField && layout === 'separable' ? m : a.output.n), 0);
    return { memory: BASELINE_MEMORY + mem + 64 * (layout === 'separable' ? m : 0), work: work + 20 * m };
  }
  const [x, y] = axes as [AxisPlan, AxisPlan];
  const nin = x.inputSamples * y.inputSamples;
  const mem = 16 * (2 * nin + x.output.n * x.inputSamples + y.output.n * y.inputSamples + y.inputSamples * x.output.n) + 64 * m;
  const separableWork = 8 * (nin * x.output.n + y.output.n * y.inputSamples * x.output.n);
  // The far field at wide angles is evaluated point by point (the fast separable path is used when
  // the mapping error allows; the estimate takes the slow path).
  const work = farField ? 8 * nin * m : separableWork;
  return { memory: BASELINE_MEMORY + mem, work };
}
