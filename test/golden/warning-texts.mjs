// The text of every warning, recorded from cases that fire each code along its branches: for
// restructuring that must leave warnings as they are (the demo jobs fire only a few codes). Not part
// of the test suite; run it by hand on the built sources before and after such a change:
//
//   npm run build && node test/golden/warning-texts.mjs --check    compare with warning-texts.json
//   node test/golden/warning-texts.mjs --write                     record the current texts
//   node test/golden/warning-texts.mjs --check --dist <dir>        the same on another build's dist/
//
// Planning-only cases stand for checks made before computing; `post` cases call postChecks on the
// planner's plan with made-up diagnostics, for branches no cheap computation reaches. Any difference
// is listed per case with both texts; exit code 1 then. It takes about a minute.
import { readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));
const store = join(root, 'test/golden/warning-texts.json');
const args = process.argv.slice(2);
const mode = args[0];
const distAt = args.indexOf('--dist');
const dist = distAt >= 0 ? resolve(args[distAt + 1]) : join(root, 'dist');
if (mode !== '--check' && mode !== '--write') {
  console.error('usage: node test/golden/warning-texts.mjs --check | --write [--dist <dir>]');
  process.exit(2);
}
const load = (p) => import(pathToFileURL(join(dist, 'src', p)).href);
const { planCase } = await load('plan/planner.js');
const { runPlannedCase } = await load('run/run-case.js');
const { createEngine } = await load('kernels.js');
const { newCaseContext } = await load('run/context.js');
const engine = createEngine();
const { postChecks } = await load('analysis/validity.js');

const nm = 1e-9;
const um = 1e-6;
const mm = 1e-3;
const deg = Math.PI / 180;
const lam = 633 * nm;
const plane = (tx = 0, ty = 0) => ({ kind: 'plane', tilt: [tx, ty] });
const slit = (w, opaque = false) => ({ shape: 'slit', width: w, opaque });
const circle = (D, opaque = false) => ({ shape: 'circle', diameter: D, opaque });
const slits = (count, width, period) => ({ shape: 'slits', count, width, period, opaque: false });

function makeCase(s) {
  return {
    job: 'warning-texts',
    index: 0,
    id: 'case',
    wavelength: s.wavelength ?? lam,
    distance: s.distance,
    aperture: s.aperture,
    illumination: s.illumination ?? plane(),
    ...(s.grid ? { grid: s.grid } : {}),
    ...(s.window ? { window: s.window } : {}),
    ...(s.planes ? { planes: s.planes } : {}),
    ...(s.spectrum ? { spectrum: s.spectrum } : {}),
    ...(s.source ? { source: s.source } : {}),
    method: s.method ?? 'auto',
    swept: {},
    output: { npy: 'float64', logDecades: 5 },
    analysis: s.analysis ?? { detectors: [] },
  };
}

/** [name, how ('run' | 'plan' | diagnostics for postChecks), case, planner options]. */
const CASES = [
  ['tilt along a slit', 'run', { distance: 1, aperture: slit(100 * um), illumination: plane(0, 0.01) }],
  ['2 µm slit', 'run', { distance: 0.01, aperture: slit(2 * um) }],
  ['point source 5 mm before a 2 mm hole', 'plan', { distance: 0.1, aperture: circle(2 * mm), source: { kind: 'point', distance: 5 * mm, at: [0, 0] } }],
  ['beam on an annulus obscuration', 'run', { distance: 0.1, aperture: { shape: 'annulus', outer: 40 * um, inner: 24 * um, opaque: false }, illumination: { kind: 'gaussian', waist: 2 * um, tilt: [0, 0] } }],
  ['beam beside an opaque disc', 'plan', { distance: 1, aperture: circle(400 * um, true), illumination: { kind: 'gaussian', waist: 20 * um, tilt: [0, 0] } }],
  ['screen at half a wavelength', 'run', { distance: 0.5 * lam, aperture: slit(20 * um) }],
  ['coarse given pitch', 'run', { distance: 1, aperture: slit(100 * um), grid: { pitch: (100 * um) / 3 } }],
  ['fresnel near a wide slit', 'run', { distance: 2 * mm, aperture: slit(1 * mm), method: 'fresnel' }],
  ['a 25 mm f/4 lens at its focus (paraxial lens)', 'plan', { distance: 0.1, aperture: { shape: 'lens', focal: 0.1, stop: 25 * mm, aberrations: [], opaque: false } }],
  ['blazed grating of 10 periods', 'run', { distance: 1, aperture: { shape: 'grating', profile: { kind: 'blazed', depth: 1 }, count: 10, period: 10 * um, opaque: false } }],
  ['grating of finite length in a short given window', 'run', { distance: 2, window: [0.3, 2 * mm], aperture: { shape: 'grating', profile: { kind: 'sinusoidal-phase', modulation: 0.2 }, count: 100, period: 20 * um, length: 1 * mm, opaque: false } }],
  ['grating of finite length', 'run', { distance: 2, aperture: { shape: 'grating', profile: { kind: 'sinusoidal-phase', modulation: 0.2 }, count: 100, period: 20 * um, length: 1 * mm, opaque: false } }],
  ['a 3 µm pinhole at a lens focus, screen 0.2 mm on (planes outside Fresnel)', 'plan', { distance: 0.2 * mm, aperture: { shape: 'lens', focal: 10 * mm, stop: 4 * mm, aberrations: [], opaque: false }, illumination: { kind: 'gaussian', waist: 1 * mm, tilt: [0, 0] }, planes: [{ after: 10 * mm, aperture: circle(3 * um) }] }],
  ['a tilted beam focused beside a pinhole (no light on the plane)', 'plan', { distance: 0.3, aperture: { shape: 'lens', focal: 50 * mm, stop: 10 * mm, aberrations: [], opaque: false }, illumination: { kind: 'gaussian', waist: 1 * mm, tilt: [5 * deg, 0] }, planes: [{ after: 50 * mm, aperture: circle(30 * um) }] }],
  ['light lost between planes (made-up powers)', { powerIn: 0.9, powerInWindow: 0.9, planes: [{ plane: 1, arriving: 1, passed: 1, sampledFromLight: false }, { plane: 2, arriving: 0.9, passed: 0.9, sampledFromLight: true }] }, { distance: 0.3, aperture: { shape: 'lens', focal: 50 * mm, stop: 10 * mm, aberrations: [], opaque: false }, illumination: { kind: 'gaussian', waist: 1 * mm, tilt: [0, 0] }, planes: [{ after: 50 * mm, aperture: { shape: 'lens', focal: 50 * mm, stop: null, aberrations: [], opaque: false } }] }],
  ['a fast 1 mm lens by the angular spectrum (its own spherical aberration)', 'plan', { distance: 5 * mm, aperture: { shape: 'lens', focal: 5 * mm, stop: 1 * mm, aberrations: [], opaque: false }, method: 'angular-spectrum' }],
  ['fresnel near a wide square', 'plan', { distance: 2 * mm, aperture: { shape: 'rectangle', width: 1 * mm, height: 1 * mm, opaque: false }, method: 'fresnel' }],
  ['fresnel near an opaque disc', 'plan', { distance: 2 * mm, aperture: circle(1 * mm, true), method: 'fresnel' }],
  ['far-field formula at N_F 2', 'run', { distance: (0.5 * mm) ** 2 / (2 * lam), aperture: slit(1 * mm), method: 'fraunhofer' }],
  ['far-field formula forced on a disc near by', 'plan', { distance: 0.05, aperture: circle(1 * mm), method: 'fraunhofer' }],
  ['window of the central lobe', 'run', { distance: 1, aperture: slit(100 * um), window: [(2 * lam) / (100 * um), (2 * lam) / (100 * um)] }],
  ['grating in a given window', 'run', { distance: 10, method: 'fraunhofer', window: [0.4, 0.4], aperture: slits(40, 10 * um, 20 * um) }],
  ['opaque disc in a small given window', 'run', { distance: 1, aperture: circle(100 * um, true), window: [2 * mm, 2 * mm] }],
  ['angular spectrum on a small grid', 'run', { distance: 1, aperture: slit(100 * um), method: 'angular-spectrum', grid: { size: 256 } }],
  ['sub-wavelength slit', 'run', { distance: 5 * um, aperture: slit(0.3 * um), method: 'angular-spectrum' }],
  ['fresnel transfer function on a fine grid', 'run', { distance: 1, aperture: slit(100 * um), method: 'fresnel', grid: { size: 4096, pitch: 1 * um } }],
  ['wide window over a large disc', 'plan', { distance: 1, aperture: circle(20 * mm), window: [0.5, 0.5], method: 'fresnel' }, { maxMemoryBytes: 1e15, maxWork: Infinity }],
  ['given grid short of the aperture (FFT)', 'run', { distance: 0.1, aperture: slit(1 * mm), method: 'angular-spectrum', grid: { size: 256, pitch: 2 * um } }],
  ['given grid short of the aperture (direct)', 'plan', { distance: 1, aperture: slit(1 * mm), method: 'fraunhofer', grid: { size: 64, pitch: 2 * um } }],
  ['aliased grating', 'run', { distance: 1, aperture: slits(20, 5 * um, 10 * um), grid: { pitch: 4 * um } }],
  ['fine grating, planner window', 'plan', { distance: 1, aperture: slits(2000, 0.5 * um, 1 * um) }],
  ['fine grating, wide grating', 'plan', { distance: 1, aperture: slits(200, 2 * um, 4 * um) }],
  ['grating with orders outside a given window', 'run', { distance: 0.4, method: 'fraunhofer', window: [0.2, 0.2], aperture: slits(20, 4 * um, 10 * um) }],
  ['grating with evanescent orders', 'run', { distance: 1, method: 'fraunhofer', window: [1.4, 1.4], aperture: slits(20, 4 * um, 10 * um), illumination: plane(30 * deg) }],
  ['paraxial method on a steep grating', 'run', { distance: 0.01, method: 'fresnel', aperture: slits(20, 1.75 * lam, 3.5 * lam) }],
  ['paraxial method on a steep grating, given window', 'run', { distance: 0.01, method: 'fresnel', aperture: slits(20, 1.75 * lam, 3.5 * lam), window: [0.05, 0.05] }],
  ['paraxial method on a tilted grating', 'run', { distance: 0.005, method: 'fresnel', aperture: slits(12, 4 * lam, 8 * lam), illumination: plane(30 * deg) }],
  ['grating at 1 mm', 'run', { distance: 1e-3, aperture: slits(20, 5 * um, 10 * um) }],
  ['sub-micron grating at 30 µm', 'run', { distance: 30 * um, aperture: slits(20, 0.5 * um, 1 * um) }],
  ['grating on a pitch of half a slit', 'run', { distance: 1, aperture: slits(20, 5 * um, 10 * um), grid: { pitch: 2.5 * um } }],
  ['two slits at 1 mm', 'run', { distance: 1e-3, aperture: slits(2, 5 * um, 10 * um) }],
  ['one-wave blazed reflection grating lit normally, orders at 18°', 'run', { distance: 1, method: 'fraunhofer', window: [2, 2], aperture: { shape: 'grating', profile: { kind: 'blazed', depth: 1 }, count: 50, period: 2 * um, opaque: false, reflective: true } }],
  ['grating with 10 slits, given window', 'run', { distance: 10, method: 'fraunhofer', aperture: slits(10, 10 * um, 20 * um), window: [2, 2] }],
  ['detectors partly and wholly outside a given window', 'run', { distance: 1, aperture: slit(100 * um), window: [6 * mm, 6 * mm], analysis: { detectors: [{ kind: 'square', size: 2 * mm, at: [3 * mm, 0] }, { kind: 'square', size: 2 * mm, at: [5 * mm, 0] }, { kind: 'square', size: 1 * mm, at: [0, 0] }] } }],
  ['pinhole detector half outside (2-D)', 'run', { distance: 0.1, aperture: circle(50 * um), window: [1 * mm, 1 * mm], analysis: { detectors: [{ kind: 'pinhole', size: 0.4 * mm, at: [0.5 * mm, 0] }] } }],
  ['detector beyond the planner window', 'run', { distance: 0.1, aperture: circle(50 * um), analysis: { detectors: [{ kind: 'pinhole', size: 0.1 * mm, at: [20 * mm, 3 * mm] }] } }],
  ['white light through a 100-slit grating in 31 samples', 'plan', { distance: 1, window: [1.2, 1.2], aperture: slits(100, 1 * um, 2 * um), spectrum: { kind: 'band', from: 400 * nm, to: 700 * nm, samples: 31 } }],
  ['spectrometer with a 1.667 µm grating (λ/d 0.38)', 'plan', { wavelength: 633 * nm, distance: 2 * mm, aperture: slits(400, 0.8 * um, 1.667 * um), illumination: plane(10 * deg), analysis: { detectors: [], spectrometer: { slit: 10 * um, collimator: 0.2, camera: 0.2, pixel: 7 * um, pixels: 256, centre: { wavelength: 633 * nm, order: 1 } } } }],
  ['slit, planner window, unexpected loss', { powerIn: 1, powerInWindow: 0.8 }, { distance: 1, aperture: slit(100 * um) }],
  ['slit, planner window, loss as planned', { powerIn: 1, powerInWindow: 0.93 }, { distance: 1, aperture: slit(100 * um) }],
  ['disc, planner grid: excess, edge energy, band limit', { powerIn: 1, powerInWindow: 1.2, edgeEnergy: 0.05, bandLimitLoss: 0.03 }, { distance: 1 * mm, aperture: circle(200 * um), method: 'angular-spectrum' }],
  ['slit, planner grid: edge energy, band limit, evanescent (computed)', { powerIn: 1, powerInWindow: 0.5, edgeEnergy: 0.05, bandLimitLoss: 0.03, evanescentLoss: 0.2 }, { distance: 1 * mm, aperture: slit(200 * um), method: 'angular-spectrum' }],
];

const out = {};
for (const [name, how, spec, opts] of CASES) {
  const plan = planCase(makeCase(spec), opts ?? {});
  if (plan.error) {
    out[name] = { error: plan.error };
    continue;
  }
  const warnings = how === 'plan' ? plan.warnings : how === 'run' ? runPlannedCase(plan, newCaseContext(engine)).warnings : postChecks(plan, how);
  out[name] = warnings.map((w) => ({ code: w.code, message: w.message }));
}

if (mode === '--write') {
  writeFileSync(store, JSON.stringify(out, null, 1) + '\n');
  const codes = new Set(Object.values(out).flatMap((ws) => (Array.isArray(ws) ? ws.map((w) => w.code) : [])));
  console.log(`recorded ${Object.keys(out).length} cases, codes: ${[...codes].sort().join(', ')}`);
  process.exit(0);
}
const was = JSON.parse(readFileSync(store, 'utf8'));
const problems = [];
for (const [k, v] of Object.entries(was)) {
  if (!(k in out)) problems.push(`${k}: missing now`);
  else if (JSON.stringify(out[k]) !== JSON.stringify(v)) problems.push(`${k}:\n    was ${JSON.stringify(v)}\n    now ${JSON.stringify(out[k])}`);
}
for (const k of Object.keys(out)) if (!(k in was)) problems.push(`${k}: new case`);
if (problems.length) {
  console.error(`${problems.length} difference(s) from the recorded warning texts:\n  ${problems.join('\n  ')}`);
  process.exit(1);
}
console.log(`all ${Object.keys(was).length} cases' warnings as recorded`);
