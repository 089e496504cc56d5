// By hand, not a test (tests never time anything): the far field by the tabulated spectrum
// (src/optics/spectrum-table.ts) against the per-point sums of propagateFarField (direct.ts) on
// wide, tilted windows. The direct sums run on every k-th point of the window only (a few thousand
// points), and their time is scaled to the whole window by the point count (their cost is
// proportional to it). Invented set-ups: a mid-infrared beam through a rectangular stop, and an
// obstacle of the same size in the beam.
//
//   node test/optics/spectrum-table-measure.mjs [k]
//
// Runs the TypeScript sources through Vite (installed for vitest), so nothing needs building.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
try {
  const { createEngine } = await server.ssrLoadModule('/src/kernels.ts');
  const { centredAxis } = await server.ssrLoadModule('/src/optics/field.ts');
  const { sourceField2D } = await server.ssrLoadModule('/src/optics/source.ts');
  const { propagateFarField } = await server.ssrLoadModule('/src/optics/direct.ts');
  const st = await server.ssrLoadModule('/src/optics/spectrum-table.ts');
  const engine = createEngine();
  console.log(`FFT kernel: ${engine.name}`);
  const every = Number(process.argv[2] ?? 10);
  const deg = Math.PI / 180;
  const half = 1.776 * Math.tan(40 * deg);
  const cases = [
    {
      // Window ±40° about the axis, 401²; source pitch 1/(4·f_max) per axis (the planner's far-field
      // rule for 2-D grids), 28 samples across the 57 µm side at most, over the open rectangle.
      name: '240 µm × 57 µm rectangle, 79 µm Gaussian, 29°, window ±40° as 401²',
      aperture: { shape: 'rectangle', width: 240e-6, height: 57e-6, opaque: false },
      grid: [1.054e-6, 1.849e-6, 231, 33],
      out: [centredAxis(401, (2 * half) / 400), centredAxis(401, (2 * half) / 400)],
    },
    {
      // The planner's grid and window for the same rectangle as an obstacle in the beam
      // (spotcast plan: 343 × 241 samples at 1.567/2.009 µm, window centred where the beam lands,
      // 1503 × 1351 points).
      name: '240 µm × 57 µm obstacle in the 79 µm Gaussian, 29°, window 2.98 m as 1503 × 1351',
      aperture: { shape: 'rectangle', width: 240e-6, height: 57e-6, opaque: true },
      grid: [1.567e-6, 2.009e-6, 343, 241],
      out: [centredAxis(1503, 2.9806 / 1502, 0.9845), centredAxis(1351, 2.9806 / 1350)],
    },
    {
      // A large source: a 600 µm disc lit at 20° by a plane wave at 1 µm, sampled at λ/4 (2404² samples),
      // on a 401² window ±30° about the beam at 1 m; whole, and cut into tiles by a 64 MiB limit.
      name: '600 µm disc, plane wave at 1 µm, 20°, window ±30° about the beam as 401²',
      wavelength: 1e-6,
      z: 1,
      tilt: 20 * deg,
      light: 'plane',
      aperture: { shape: 'circle', diameter: 600e-6, opaque: false },
      grid: [0.25e-6, 0.25e-6, 2404, 2404],
      out: [centredAxis(401, (2 * Math.tan(30 * deg)) / 400, Math.tan(20 * deg)), centredAxis(401, (2 * Math.tan(30 * deg)) / 400)],
      every: 40,
      limits: [undefined, 64 * 2 ** 20],
    },
  ];
  for (const c of cases) {
    const [dx, dy, nx, ny] = c.grid;
    const lam = c.wavelength ?? 4.755e-6;
    const z = c.z ?? 1.776;
    const tilt = c.tilt ?? 29 * deg;
    const carrier = [Math.sin(tilt) / lam, 0];
    const ill = c.light === 'plane' ? { kind: 'plane', tilt: [tilt, 0] } : { kind: 'gaussian', waist: 79e-6, tilt: [tilt, 0] };
    const src = sourceField2D(c.aperture, ill, centredAxis(nx, dx), centredAxis(ny, dy), lam, {
      sampleCarrier: false,
      obstructed: c.aperture.opaque,
    }).field;
    const [outX, outY] = c.out;
    const points = outX.n * outY.n;
    const band = st.farFieldBand(outX, outY, z, lam, carrier);
    const k = c.every ?? every;
    const subX = { n: Math.floor((outX.n - 1) / k) + 1, start: outX.start, step: k * outX.step };
    const subY = { n: Math.floor((outY.n - 1) / k) + 1, start: outY.start, step: k * outY.step };
    let t = performance.now();
    const ref = propagateFarField(engine, src, z, subX, subY, carrier);
    const tRef = performance.now() - t;
    const scaled = (tRef / (subX.n * subY.n)) * points;
    console.log(`\n${c.name}`);
    console.log(`  source ${nx} × ${ny} samples; ${points} points; band fx [${band.fx.map((f) => (f * lam).toFixed(3)).join(', ')}]/λ, fy [${band.fy.map((f) => (f * lam).toFixed(3)).join(', ')}]/λ`);
    console.log(`  propagateFarField on every ${k}th point (${subX.n} × ${subY.n}): ${tRef.toFixed(0)} ms, so about ${(scaled / 1000).toFixed(0)} s on the whole window (planner's estimate ${((8 * nx * ny * points) / 2e8).toFixed(0)} s)`);
    for (const maxMemory of c.limits ?? [undefined]) {
      const opts = maxMemory ? { maxMemory } : {};
      const cost = st.costFarFieldTable({ nx, ny, dx, dy }, band, points, opts);
      const rss0 = process.memoryUsage().rss;
      t = performance.now();
      const full = st.farFieldByTable(engine, src, z, outX, outY, carrier, opts);
      const tFull = performance.now() - t;
      const rss1 = process.memoryUsage().rss;
      let peak = 0;
      let diff = 0;
      for (let r = 0; r < subY.n; r++) {
        for (let col = 0; col < subX.n; col++) {
          const i = 2 * (r * subX.n + col);
          const j = 2 * (r * k * outX.n + col * k);
          peak = Math.max(peak, Math.hypot(ref.data[i], ref.data[i + 1]));
          diff = Math.max(diff, Math.hypot(ref.data[i] - full.data[j], ref.data[i + 1] - full.data[j + 1]));
        }
      }
      console.log(`  farFieldByTable${maxMemory ? ` (limit ${maxMemory / 2 ** 20} MiB)` : ''}: ${cost.tiles.join(' × ')} tile(s) of ${cost.entries.join(' × ')} entries (${cost.mode.join('/')}), bound ${cost.errorBound.toExponential(2)} of Σ|U|ΔA`);
      console.log(`    ${tFull.toFixed(0)} ms (estimate ${((cost.work / 2e8) * 1000).toFixed(0)} ms at 2e8 units/s; memory estimate ${(cost.memory / 2 ** 20).toFixed(1)} MiB, resident set grew ${((rss1 - rss0) / 2 ** 20).toFixed(0)} MiB)`);
      console.log(`    largest difference from the direct sums on their points: ${(diff / peak).toExponential(2)} of their peak |U|`);
    }
  }
} finally {
  await server.close();
}
