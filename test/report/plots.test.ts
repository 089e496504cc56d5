import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { existsSync } from 'node:fs';
import { compile, type TopLevelSpec } from 'vega-lite';
import { Resvg } from '@resvg/resvg-js';
import { fresnelCrossing, plotSpec, renderPlot, sweepPlots, type PlotInput } from '../../src/report/plots.js';
import type { JobReport, MetricInfo, ReportCase, SweepKey } from '../../src/report/types.js';

// The data below are invented demo values (a pinhole in front of a camera); only the formulas
// named beside each check are outside facts.

interface Layer {
  mark: { type: string };
  data?: { values: { x: number; label?: string }[] };
  encoding: { x: { scale?: { type: string }; title?: string }; y?: { scale?: { type: string }; title?: string } };
}
const layersOf = (spec: object): Layer[] => (spec as { layer: Layer[] }).layer;
const valuesOf = (spec: object) => (spec as { data: { values: { x: number; y: number; series: string }[] } }).data.values;

function input(over: Partial<PlotInput> = {}): PlotInput {
  return {
    title: 'spot radius against distance',
    x: { label: 'distance', unit: 'm', log: false },
    y: { label: 'spot radius', unit: 'm', log: false },
    points: [1e-3, 2e-3, 3e-3, 4e-3].map((x) => ({ x, y: 2e-5 * (x / 1e-3) })),
    ...over,
  };
}

/** Text content of every <text> element in an SVG (vega writes one element per label). */
const svgTexts = (svg: string): string[] => [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!);
/** aria-label attributes: vega describes axes and every mark item in them, in display units. */
const ariaLabels = (svg: string): string[] => [...svg.matchAll(/aria-label="([^"]*)"/g)].map((m) => m[1]!);

describe('plotSpec: axes', () => {
  // Which axes are logarithmic is the caller's choice, never inferred (common practice: log
  // axes for log-spaced sweeps and for quantities spanning decades).
  it.each([
    [false, false],
    [true, false],
    [false, true],
    [true, true],
  ])('x log %s, y log %s: log scales exactly where asked, in the spec and after compilation', (xl, yl) => {
    const spec = plotSpec(input({ x: { label: 'distance', unit: 'm', log: xl }, y: { label: 'peak', unit: '1', log: yl } }));
    for (const layer of layersOf(spec).filter((l) => l.mark.type === 'line' || l.mark.type === 'point')) {
      expect(layer.encoding.x.scale?.type === 'log').toBe(xl);
      expect(layer.encoding.y?.scale?.type === 'log').toBe(yl);
    }
    // The vega spec that is actually rendered, compiled by vega-lite itself.
    const scales = (compile(spec as TopLevelSpec).spec as { scales: { name: string; type: string }[] }).scales;
    expect(scales.find((s) => s.name === 'x')!.type === 'log').toBe(xl);
    expect(scales.find((s) => s.name === 'y')!.type === 'log').toBe(yl);
  });

  it('converts metres to one readable unit per axis: 1e-3 m is 1 mm, 2e-5 m is 20 µm', async () => {
    // SI prefixes: milli = 1e-3, micro = 1e-6 (BIPM, The International System of Units, table 7).
    const p = input();
    const spec = plotSpec(p);
    expect(valuesOf(spec).map((v) => v.x)).toEqual([1, 2, 3, 4].map((v) => expect.closeTo(v, 12)));
    expect(valuesOf(spec).map((v) => v.y)).toEqual([20, 40, 60, 80].map((v) => expect.closeTo(v, 10)));
    const { svg } = await renderPlot(p);
    const texts = svgTexts(svg);
    expect(texts).toContain('distance (mm)');
    expect(texts).toContain('spot radius (µm)');
    // Tick labels are numbers in the display unit, not in metres.
    const ticks = texts.map(Number).filter((v) => Number.isFinite(v));
    expect(ticks).toContain(1);
    expect(ticks).toContain(80);
    expect(ticks.some((v) => v > 0 && v < 0.01)).toBe(false);
    // vega's own description of the x axis states the domain in the converted unit.
    expect(ariaLabels(svg).some((a) => /X-axis titled 'distance \(mm\)'.*values from 1(\.0)? to 4(\.0)?$/.test(a))).toBe(true);
  });

  it('keeps dimensionless axes as given and picks nm for wavelengths', () => {
    const spec = plotSpec(input({
      x: { label: 'wavelength', unit: 'm', log: false },
      y: { label: 'encircled energy', unit: '1', log: false },
      points: [450e-9, 532e-9, 633e-9].map((x) => ({ x, y: 0.8 })),
    }));
    expect(valuesOf(spec).map((v) => v.x)).toEqual([450, 532, 633].map((v) => expect.closeTo(v, 9)));
    expect(valuesOf(spec).map((v) => v.y)).toEqual([0.8, 0.8, 0.8]);
    expect(layersOf(spec)[0]!.encoding.x.title).toBe('wavelength (nm)');
    expect(layersOf(spec)[0]!.encoding.y!.title).toBe('encircled energy');
  });
});

describe('plotSpec: missing values', () => {
  it('leaves a gap at a null value: no point there, and the line is broken around it', async () => {
    const p = input({
      points: [
        ...[1e-3, 2e-3, 3e-3, 4e-3, 5e-3].map((x) => ({ x, y: x === 3e-3 ? null : 1e-5 * (x / 1e-3), series: 'D 50 µm' })),
        ...[1e-3, 2e-3, 3e-3, 4e-3, 5e-3].map((x) => ({ x, y: 3e-5 + 1e-5 * (x / 1e-3), series: 'D 80 µm' })),
      ],
    });
    const spec = plotSpec(p);
    const gapSeries = valuesOf(spec).filter((v) => v.series === 'D 50 µm');
    expect(gapSeries.map((v) => v.x)).toEqual([1, 2, 4, 5].map((v) => expect.closeTo(v, 12)));
    // Not drawn as zero either.
    expect(valuesOf(spec).some((v) => v.y === 0)).toBe(false);

    const { svg } = await renderPlot(p);
    const pointLabels = ariaLabels(svg).filter((a) => a.startsWith('distance (mm): ') && !a.includes('run:'));
    const at = (series: string, x: number) => pointLabels.filter((a) => a.includes(`distance (mm): ${x};`) && a.includes(series));
    expect(at('D 50 µm', 3)).toHaveLength(0);
    expect(at('D 80 µm', 3)).toHaveLength(1);
    expect(at('D 50 µm', 4)).toHaveLength(1);
    // The broken series is drawn as two line paths, the complete one as one.
    const lines = [...svg.matchAll(/<path aria-label="([^"]*)"[^>]*aria-roledescription="line mark"[^>]*d="([^"]*)"/g)];
    const pathsOf = (series: string) => lines.filter((m) => m[1]!.includes(`series: ${series};`));
    expect(pathsOf('D 50 µm')).toHaveLength(2);
    expect(pathsOf('D 80 µm')).toHaveLength(1);
    // Two vertices each (x = 1, 2 and x = 4, 5): nothing bridges x = 3.
    for (const m of pathsOf('D 50 µm')) expect(m[2]!.split('L')).toHaveLength(2);
  });

  it('drops values a log axis cannot show (zero, negative) as gaps', () => {
    const spec = plotSpec(input({
      y: { label: 'side-lobe level', unit: '1', log: true },
      points: [1e-3, 2e-3, 3e-3].map((x, i) => ({ x, y: [0.05, 0, 0.02][i]! })),
    }));
    expect(valuesOf(spec).map((v) => v.y)).toEqual([0.05, 0.02]);
  });
});

describe('N_F = 1 boundary', () => {
  // Fresnel number N_F = a²/(λz) (Goodman, Introduction to Fourier Optics, §4.2), so N_F = 1
  // at z = a²/λ. For a log-spaced distance sweep log N_F is linear in log z, so interpolating
  // in log z finds that distance to rounding error.
  const a = 25e-6, lambda = 500e-9;
  const zCross = (a * a) / lambda; // 1.25 mm
  const nf = (z: number) => (a * a) / (lambda * z);

  it('log sweep: the crossing is at z = a²/λ', () => {
    const zs = [1e-4, 3e-4, 1e-3, 3e-3, 1e-2];
    const x = fresnelCrossing(zs.map((z) => ({ x: z, fresnelNumber: nf(z) })), true);
    expect(x! / zCross).toBeCloseTo(1, 12);
  });

  it('linear sweep: interpolated linearly, within the interpolation error of log z', () => {
    // Chord of log z over a step h lies below it by at most h²/(8 z²): with h = 0.1 mm near
    // 1.2 mm that is 9e-4 in log N_F, i.e. a relative error in z below 1e-3.
    const zs = Array.from({ length: 11 }, (_, i) => 1e-3 + i * 1e-4);
    const x = fresnelCrossing(zs.map((z) => ({ x: z, fresnelNumber: nf(z) })), false);
    expect(Math.abs(x! / zCross - 1)).toBeLessThan(1e-3);
    // The chord of the concave log z lies below it, so the interpolated crossing cannot be early.
    expect(x).toBeGreaterThanOrEqual(zCross * (1 - 1e-12));
    expect(x).toBeLessThan(1.3e-3);
  });

  it('no crossing, or no Fresnel numbers: null', () => {
    expect(fresnelCrossing([2e-3, 3e-3].map((z) => ({ x: z, fresnelNumber: nf(z) })), true)).toBeNull();
    expect(fresnelCrossing([1e-4, 1e-2].map((z) => ({ x: z, fresnelNumber: null })), true)).toBeNull();
  });

  it('is drawn as a labelled rule at that x, in display units, only inside the x range', async () => {
    const p = input({ points: [1e-3, 2e-3].map((x) => ({ x, y: 1e-5 })), nfBoundary: zCross });
    const layers = layersOf(plotSpec(p));
    const rule = layers.find((l) => l.mark.type === 'rule')!;
    expect(rule.data!.values[0]!.x).toBeCloseTo(1.25, 12);
    expect(layers.find((l) => l.mark.type === 'text')!.data!.values[0]!.label).toBe('N_F = 1');
    const { svg } = await renderPlot(p);
    expect(svgTexts(svg)).toContain('N_F = 1');
    expect(ariaLabels(svg)).toContain('x: 1.25');

    for (const outside of [0.5e-3, 3e-3, null]) {
      expect(layersOf(plotSpec({ ...p, nfBoundary: outside })).some((l) => l.mark.type === 'rule')).toBe(false);
    }
  });
});

describe('renderPlot', () => {
  it('writes an SVG with the axis titles and a PNG of 640×400 that decodes and is not blank', async () => {
    const { svg, png } = await renderPlot(input({ x: { label: 'distance', unit: 'm', log: true } }));
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svgTexts(svg)).toEqual(expect.arrayContaining(['distance (mm)', 'spot radius (µm)', 'spot radius against distance']));
    const img = PNG.sync.read(png); // PNG signature and chunks checked by pngjs
    expect([img.width, img.height]).toEqual([640, 400]);
    // White background, with dark ink somewhere (the line and axes).
    let white = 0, dark = 0;
    for (let i = 0; i < img.data.length; i += 4) {
      const l = img.data[i]! + img.data[i + 1]! + img.data[i + 2]!;
      if (l === 765) white++;
      if (l < 300) dark++;
    }
    expect(white / (img.width * img.height)).toBeGreaterThan(0.7);
    expect(dark).toBeGreaterThan(200);
  });
});

describe('renderPlot: text in the PNG', () => {
  // Rasterised text needs a font file on the machine; the project's machines carry DejaVu. Where
  // it is missing the PNG still renders, without text (see the note in plots.ts).
  const dejavu = '/usr/share/fonts/truetype/dejavu';
  it.skipIf(!existsSync(dejavu))('draws the title: the PNG differs from the same SVG with its text removed', async () => {
    const { svg, png } = await renderPlot(input());
    const bare = Buffer.from(new Resvg(svg.replace(/<text[^>]*>[^<]*<\/text>/g, ''), { background: 'white' }).render().asPng());
    const a = PNG.sync.read(png), b = PNG.sync.read(bare);
    // The title sits in the top 30 rows, above the plot area.
    let inked = 0, bareInk = 0;
    for (let y = 0; y < 30; y++) {
      for (let x = 0; x < a.width; x++) {
        const i = (y * a.width + x) * 4;
        if (a.data[i]! < 128) inked++;
        if (b.data[i]! < 128) bareInk++;
      }
    }
    expect(bareInk).toBe(0);
    expect(inked).toBeGreaterThan(50);
  });
});

describe('sweepPlots', () => {
  const sweeps: SweepKey[] = [
    { key: 'wavelength', label: 'wavelength', unit: 'm', spacing: 'list', values: [633e-9, 450e-9] },
    { key: 'aperture.diameter', label: 'aperture diameter', unit: 'm', spacing: 'list', values: [50e-6] },
    { key: 'distance', label: 'distance', unit: 'm', spacing: 'log', values: [1e-3, 1e-2, 1e-1] },
  ];
  const metrics: MetricInfo[] = [
    { key: 'firstZeroRadius', label: 'first-zero radius', unit: 'm' },
    { key: 'peak', label: 'peak', unit: '1', log: true },
    { key: 'rarelyDefined', label: 'rarely defined', unit: '1' },
  ];
  const a = 25e-6;
  const cases: ReportCase[] = [];
  for (const wl of sweeps[0]!.values) {
    for (const z of sweeps[2]!.values) {
      const failed = wl === 450e-9 && z === 1e-1;
      cases.push({
        id: `c${cases.length}`,
        folder: `c${cases.length}`,
        status: failed ? 'failed' : 'done',
        swept: { wavelength: wl, distance: z },
        wavelength: wl,
        distance: z,
        fresnelNumber: (a * a) / (wl * z),
        regime: null,
        method: null,
        metrics: failed ? {} : { firstZeroRadius: (1.21967 * wl * z) / (2 * a), peak: 1 / z, rarelyDefined: z === 1e-3 && wl === 633e-9 ? 0.5 : null },
        warnings: [],
        reasons: [],
      });
    }
  }
  const report: JobReport = {
    job: 'pinhole-camera', file: 'pinhole.yaml', given: {}, toolVersion: '0', createdAt: '', sweeps, metrics, cases, tables: [], plots: [], plans: [],
  };
  const plots = sweepPlots(report);

  it('one plot per swept key and metric with two values; single-valued keys and sparse metrics get none', () => {
    expect(plots.map((p) => p.title)).toEqual([
      'first-zero radius against wavelength',
      'peak against wavelength',
      'first-zero radius against distance',
      'peak against distance',
    ]);
  });

  it('log x for the log-spaced key, log y where the metric asks for it', () => {
    expect(plots.map((p) => [p.x.log, p.y.log])).toEqual([[false, false], [false, true], [true, false], [true, true]]);
  });

  it('series are the other swept keys with units; failed cases are left out', () => {
    const byDistance = plots[2]!;
    expect([...new Set(byDistance.points.map((q) => q.series))]).toEqual(['λ 633 nm', 'λ 450 nm']);
    expect(byDistance.points).toHaveLength(5);
    expect(byDistance.points.some((q) => q.series === 'λ 450 nm' && q.x === 1e-1)).toBe(false);
    expect(new Set(plots[0]!.points.map((q) => q.series))).toEqual(new Set(['z 1 mm', 'z 10 mm', 'z 100 mm']));
  });

  it('passes the first N_F = 1 crossing, z = a²/λ of the first series (Fresnel number, Goodman §4.2)', () => {
    // λ = 633 nm, a = 25 µm: z = a²/λ ≈ 0.987 mm lies below the sweep's 1 mm, so the first series
    // does not cross; λ = 450 nm crosses at 1.389 mm.
    expect(plots[2]!.nfBoundary! / ((a * a) / 450e-9)).toBeCloseTo(1, 12);
    // Along wavelength (a list: linear interpolation), at z = 1 mm: N_F = 1 at λ = a²/z = 625 nm.
    // log N_F = const − log λ and the chord of the concave log lies below it, so the interpolated
    // crossing is at or above 625 nm and below the next sample, 633 nm; the chord error over
    // [450, 633] nm is at most h²/(8λ²) = 0.021 in log N_F, which the chord's slope turns into at
    // most 11 nm, under 2 %.
    const wl = plots[0]!.nfBoundary!;
    expect(wl).toBeGreaterThanOrEqual(625e-9 * (1 - 1e-12));
    expect(wl).toBeLessThan(633e-9);
    expect(Math.abs(wl / 625e-9 - 1)).toBeLessThan(2e-2);
  });
});

describe('sweepPlots: the spot-size chart and the dense axial curve', () => {
  // Invented demo values of a 50 µm slit at 633 nm over four distances: the far-field half-width
  // holding half the power is proportional to z (λz/w times a constant), the shadow w/2 throughout.
  const zs = [1e-3, 1e-2, 1e-1, 1];
  const info = (key: string, label: string, reference?: boolean): MetricInfo => ({ key, label, unit: 'm', log: true, chart: { name: 'spot size (x)', ...(reference ? { reference: true } : {}) } });
  const metrics: MetricInfo[] = [
    info('spot_x_m', 'computed (x)'),
    info('shadow_x_m', 'geometric shadow (x)', true),
    info('far_field_size_x_m', 'far field (x)', true),
    { key: 'on_axis_intensity', label: 'on-axis intensity (relative)', unit: '1', log: true },
  ];
  const cases: ReportCase[] = zs.map((z, i) => ({
    id: `c${i}`, folder: `c${i}`, status: 'done', swept: { distance: z }, wavelength: 633e-9, distance: z, fresnelNumber: 25e-6 ** 2 / (633e-9 * z),
    regime: null, method: null, warnings: [], reasons: [],
    metrics: { spot_x_m: Math.max(25e-6, 0.44 * 633e-9 * z / 50e-6), shadow_x_m: 12.5e-6, far_field_size_x_m: (0.44 * 633e-9 * z) / 50e-6, on_axis_intensity: 1 / (1 + z) },
  }));
  const z = Array.from({ length: 240 }, (_, i) => 1e-3 * 1000 ** (i / 239));
  const report: JobReport = {
    job: 'slit', file: 'slit.yaml', given: {}, toolVersion: '0', createdAt: '', cases, tables: [], plots: [], plans: [], metrics,
    sweeps: [{ key: 'distance', label: 'distance', unit: 'm', spacing: 'log', values: zs }],
    onAxis: { z, intensity: z.map((v) => (v < 0.5 ? 0 : 1 / (1 + v))), how: 'test' },
  };
  const plots = sweepPlots(report);

  it('draws the spot and its two references in one log–log chart, the references as lines only', () => {
    const chart = plots.find((p) => p.title.startsWith('spot size (x)'))!;
    expect(plots.filter((p) => p.title.includes('shadow') || p.title.includes('far field'))).toEqual([]);
    expect([chart.x.log, chart.y.log]).toEqual([true, true]);
    expect(new Set(chart.points.map((q) => q.series))).toEqual(new Set(['computed (x)', 'geometric shadow (x)', 'far field (x)']));
    expect(chart.lineOnly).toEqual(['geometric shadow (x)', 'far field (x)']);
    // The point marks leave the references out; the line marks draw all three.
    const pointLayer = layersOf(plotSpec(chart)).find((l) => l.mark.type === 'point') as unknown as { transform: { filter: { not: { oneOf: string[] } } }[] };
    expect(pointLayer.transform[0]!.filter.not.oneOf).toEqual(['geometric shadow (x)', 'far field (x)']);
  });

  it('draws the axial intensity densely through the cases, its zeros as gaps on the log axis', () => {
    const p = plots.find((q) => q.title.startsWith('on-axis intensity'))!;
    const dense = p.points.filter((q) => q.series === 'exact (dense)');
    expect(dense).toHaveLength(240);
    expect(p.points.filter((q) => q.series === 'cases')).toHaveLength(4);
    expect(p.lineOnly).toEqual(['exact (dense)']);
    expect(dense.filter((q) => q.y === null).length).toBe(z.filter((v) => v < 0.5).length);
  });
});
