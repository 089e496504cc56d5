// A fixed-seed property test of hostile job files: mutations of small valid jobs (a 50 µm pinhole
// at 1 m in 633 nm light, and a few siblings that use every other key) with type swaps, extreme
// numbers, unit strings, control characters, huge strings and lists, deep nesting, unknown and
// deleted keys, and damage to the text itself. Each input goes through the loader (as text, or as
// a file for every tenth), the sweep expansion and the planner, in this process. For each one:
//   - either a JobError (or the expansion's refusal of too many cases) whose every problem names a
//     key path or a line, with no raw control character and the whole message under 8 kB;
//   - or a job whose every expanded number is finite and not a denormal, and whose cases plan
//     (planCase may refuse with plan.error: that is an answer, not a failure);
//   - in under 10 s.
// Nothing is skipped: an input that breaks a rule is listed in the failure with its seed index.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { stringify } from 'yaml';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JobError, loadJobFile, parseJobText, type LoadedJob } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { planCase } from '../../src/plan/planner.js';
import type { Case } from '../../src/plan/types.js';
import { mulberry32 } from '../helpers.js';

// FUZZ_SEED and FUZZ_INPUTS explore beyond the suite's fixed set (FUZZ_PROFILE lists the slowest).
const SEED = Number(process.env.FUZZ_SEED ?? 20_261_202);
const INPUTS = Number(process.env.FUZZ_INPUTS ?? 600);
/** Cases planned per valid input: the first, the last and some between (a sweep may hold 100 000). */
const PLANNED_PER_JOB = 6;

type Rng = () => number;
const pick = <T>(rng: Rng, xs: readonly T[]): T => xs[Math.floor(rng() * xs.length)]!;
const int = (rng: Rng, lo: number, hi: number) => lo + Math.floor(rng() * (hi - lo + 1));

/** Valid tiny jobs: the pinhole of the issue, and siblings that reach the other keys. */
const BASES: Record<string, unknown>[] = [
  { name: 'pin', wavelength: '633 nm', distance: '1 m', aperture: { shape: 'circle', diameter: '50 um' } },
  { name: 'rect', wavelength: '532 nm', distance: '2 m', aperture: { shape: 'rectangle', width: '40 um', height: '60 um' }, window: ['4 mm', '3 mm'] },
  { name: 'slit', wavelength: '633 nm', distance: ['5 mm', '1 m'], aperture: { shape: 'slit', width: '25 um' }, method: 'auto' },
  { name: 'ring', wavelength: '633 nm', distance: '1 m', aperture: { shape: 'annulus', outer: '80 um', inner: '40 um' }, detector: { kind: 'pinhole', size: '20 um', at: ['0 mm', '0.1 mm'] } },
  { name: 'grating', wavelength: ['405 nm', '650 nm'], distance: '0.5 m', aperture: { shape: 'slits', count: 5, width: '4 um', period: '8 um' }, orders: { overlap: '2 mm' } },
  { name: 'beam', wavelength: '633 nm', distance: { from: '0.1 m', to: '1 m', count: 3, spacing: 'log' }, aperture: { shape: 'circle', diameter: '1 mm' }, illumination: { kind: 'gaussian', waist: '0.3 mm', tilt: ['1 deg', 0] } },
  { name: 'grid', wavelength: '633 nm', distance: '10 mm', aperture: { shape: 'circle', diameter: '50 um', opaque: true }, grid: { size: 256, pitch: '1 um' }, output: { npy: 'float32', logDecades: 4 } },
  { name: 'spot', wavelength: '550 nm', distance: '50 mm', aperture: { shape: 'circle', diameter: '0.25 mm' }, search: { 'smallest-spot': { between: ['50 um', '1 mm'], measure: 'energy' } } },
];

/** Every key path a job may hold, for setting and deleting. */
const PATHS = [
  'name', 'description', 'wavelength', 'distance', 'aperture', 'aperture.shape', 'aperture.diameter', 'aperture.width',
  'aperture.height', 'aperture.length', 'aperture.outer', 'aperture.inner', 'aperture.count', 'aperture.period',
  'aperture.opaque', 'illumination', 'illumination.kind', 'illumination.waist', 'illumination.tilt', 'illumination.tilt.0',
  'grid', 'grid.size', 'grid.pitch', 'window', 'window.1', 'method', 'output', 'output.npy', 'output.logDecades',
  'detector', 'detector.size', 'detector.at', 'detector.kind', 'search', 'search.smallest-spot',
  'search.smallest-spot.between', 'search.smallest-spot.measure', 'orders', 'orders.overlap', 'distance.from',
  'distance.to', 'distance.count', 'distance.spacing', 'wavelength.1', 'aperture.diameter.0',
];

const CONTROL = ['\u001b[2J', '\u001b]0;owned\u0007', '\u0000', '\u0007', '\u202e', '\r', '\u009b31m', '\u2028'];
const EXTREME_NUMBERS = [
  9007199254740993, 1e308, -1e308, 5e-324, -5e-324, 1e-308, 0, -0, -1, 1, 2, 42, 633, 0.5, 1e-10, 1e4, 10001,
  2 ** 31, 2 ** 32 + 1, 2 ** 53, 65536, 1e6, 1e6 + 1, 2.5, Infinity, -Infinity, NaN, 1.5, 1e-7, 3,
];
const UNIT_STRINGS = [
  '1e308 m', '1e-308 m', '5e-324 m', '633', '633 nm', '50 um', '-3 mm', '0 m', '1 furlong', '2 deg', '90 deg', '-89.99 deg',
  '1.5 rad', '1e400 m', '  7 mm ', '50 µm', '50 μm', '50 Mm', '1e4 m', '0.1 nm', '0.09 nm', '1.0000000000000002 m', 'NaN m',
  'Infinity m', '0x10 m', '1e-10 m', '1 km', '12 arcsec', '+5 mm', '.5 mm', '5. mm', '1e5 nm',
];
const WORDS = ['circle', 'rectangle', 'slit', 'slits', 'annulus', 'plane', 'gaussian', 'auto', 'fraunhofer', 'fresnel',
  'angular-spectrum', 'rayleigh-sommerfeld', 'pinhole', 'square', 'linear', 'log', 'float32', 'energy', 'fwhm', '', 'true',
  '=1+1', '@SUM(A1)', '../../etc/passwd', 'a: b', '- x', '*alias', '&anchor', '!!binary', 'null'];

/** A random length inside the bounds (log-uniform 1e-10 – 1e4 m), written with a unit. */
function inBoundsLength(rng: Rng): string {
  return `${Number(Math.pow(10, -10 + 14 * rng()).toPrecision(3))} m`;
}

/** Values inside the bounds but far from the bench: the planner must refuse or plan them, never break. */
const PLAUSIBLE: [string, (rng: Rng) => unknown][] = [
  ['wavelength', (rng) => `${Number(Math.pow(10, 6 * rng()).toPrecision(3))} nm`],
  ['distance', inBoundsLength],
  ['aperture.diameter', inBoundsLength],
  ['aperture.width', inBoundsLength],
  ['aperture.height', inBoundsLength],
  ['aperture.length', inBoundsLength],
  ['aperture.outer', inBoundsLength],
  ['aperture.inner', inBoundsLength],
  ['aperture.period', inBoundsLength],
  ['aperture.count', (rng) => Math.round(Math.pow(10, 6 * rng()))],
  ['illumination.waist', inBoundsLength],
  ['illumination.tilt', (rng) => [`${(rng() * 179.98 - 89.99).toFixed(2)} deg`, `${(rng() * 179.98 - 89.99).toFixed(2)} deg`]],
  ['grid.size', (rng) => 2 ** int(rng, 4, 24)],
  ['grid.pitch', inBoundsLength],
  ['window', inBoundsLength],
  ['detector.size', inBoundsLength],
  ['detector.at', (rng) => [inBoundsLength(rng), `-${inBoundsLength(rng)}`]],
  ['orders.overlap', inBoundsLength],
  ['method', (rng) => pick(rng, ['auto', 'angular-spectrum', 'fresnel', 'fraunhofer', 'rayleigh-sommerfeld'])],
  ['aperture.opaque', (rng) => rng() < 0.5],
];

function hostileValue(rng: Rng, depth = 0): unknown {
  const r = rng();
  if (r < 0.18) return pick(rng, EXTREME_NUMBERS);
  if (r < 0.36) return pick(rng, UNIT_STRINGS);
  if (r < 0.5) return inBoundsLength(rng);
  if (r < 0.56) return `${Number((1 + 1e3 * rng()).toPrecision(3))} nm`;
  if (r < 0.62) return pick(rng, WORDS);
  if (r < 0.68) return pick(rng, WORDS) + pick(rng, CONTROL) + pick(rng, WORDS);
  if (r < 0.71) return 'x'.repeat(int(rng, 1000, 100_000)) + pick(rng, CONTROL);
  if (r < 0.74) return Array.from({ length: int(rng, 1000, 30_000) }, () => pick(rng, ['1 mm', '2 um', 3, '4 nm']));
  if (r < 0.76) return Array.from({ length: 100_001 }, () => 1);
  if (r < 0.78) {
    let v: unknown = '1 mm';
    for (let i = 0, n = int(rng, 10, 200); i < n; i++) v = [v];
    return v;
  }
  if (r < 0.84) {
    const range: Record<string, unknown> = {
      from: rng() < 0.7 ? inBoundsLength(rng) : hostileValue(rng, depth + 1),
      to: rng() < 0.7 ? inBoundsLength(rng) : hostileValue(rng, depth + 1),
      count: pick(rng, [2, 3, 5, 100, 100_000, 100_001, 1, 0, -3, 2.5, 1e308, '3']),
    };
    if (rng() < 0.6) range.spacing = pick(rng, ['linear', 'log', 'cubic', 3]);
    return range;
  }
  if (r < 0.87) return depth < 2 ? [hostileValue(rng, depth + 1), hostileValue(rng, depth + 1)] : [];
  if (r < 0.9) return depth < 2 ? { [pick(rng, ['kind', 'shape', 'size', 'from', 'x'])]: hostileValue(rng, depth + 1) } : {};
  if (r < 0.93) return pick(rng, [true, false, null]);
  if (r < 0.96) return int(rng, 1, 2_000_000);
  return pick(rng, [[], {}, '', [null], { '': 1 }]);
}

function randomKey(rng: Rng): string {
  const r = rng();
  if (r < 0.3) return pick(rng, ['diamter', 'wavelenght', 'distnace', 'ilumination', 'grd', 'windw', 'detectr', 'ordrs', 'shpe', 'cuont']);
  if (r < 0.5) return 'k' + pick(rng, CONTROL) + int(rng, 0, 999);
  if (r < 0.6) return 'long' + 'y'.repeat(int(rng, 100, 50_000));
  if (r < 0.7) return '__proto__';
  if (r < 0.8) return pick(rng, ['constructor', 'toString', 'hasOwnProperty']);
  return `extra${int(rng, 0, 99)}`;
}

function setPath(obj: Record<string, unknown>, path: string, value: unknown): void {
  const parts = path.split('.');
  let o: Record<string, unknown> = obj;
  for (const p of parts.slice(0, -1)) {
    const next = o[p];
    if (next === null || typeof next !== 'object') o[p] = /^\d+$/.test(parts[parts.indexOf(p) + 1] ?? '') ? [] : {};
    o = o[p] as Record<string, unknown>;
  }
  Object.defineProperty(o, parts[parts.length - 1]!, { value, enumerable: true, writable: true, configurable: true });
}

function deletePath(obj: Record<string, unknown>, path: string): void {
  const parts = path.split('.');
  let o: unknown = obj;
  for (const p of parts.slice(0, -1)) {
    if (o === null || typeof o !== 'object') return;
    o = (o as Record<string, unknown>)[p];
  }
  if (o !== null && typeof o === 'object') delete (o as Record<string, unknown>)[parts[parts.length - 1]!];
}

/** Damage to the text itself: cut, duplicated or swapped lines, stray characters. */
function damageText(rng: Rng, text: string): string {
  const lines = text.split('\n');
  const r = rng();
  if (r < 0.2) return text.slice(0, int(rng, 0, text.length));
  if (r < 0.35) {
    const i = int(rng, 0, lines.length - 1);
    lines.splice(i, 0, lines[i]!);
    return lines.join('\n');
  }
  if (r < 0.5) {
    const i = int(rng, 0, text.length);
    return text.slice(0, i) + pick(rng, [...CONTROL, '\t', ':', '- ', '{', '[', '"', "'", '&a ', '*a', '!!str ', '? ', '%YAML 1.1\n']) + text.slice(i);
  }
  if (r < 0.6) return text.replace(/\n/g, '\r\n');
  if (r < 0.7) return '\ufeff' + text;
  if (r < 0.8) return text + '\n---\nname: second\n';
  if (r < 0.9) {
    // An alias bomb in a side key.
    return text + 'extra: &a [x, x, x, x, x, x, x, x, x]\nmore: &b [*a, *a, *a, *a, *a, *a, *a, *a, *a]\nbomb: [*b, *b, *b, *b, *b, *b, *b, *b, *b]\n';
  }
  return text.replace(/ /g, () => (rng() < 0.05 ? '\t' : ' '));
}

function generate(rng: Rng): string {
  const job = structuredClone(pick(rng, BASES)) as Record<string, unknown>;
  const n = rng() < 0.5 ? 1 : int(rng, 2, 4);
  for (let i = 0; i < n; i++) {
    const r = rng();
    if (r < 0.3) {
      const [path, gen] = pick(rng, PLAUSIBLE);
      // Only where the base has the key's parent, so that most of these stay valid jobs.
      const parent = path.includes('.') ? job[path.split('.')[0]!] : job;
      if (parent !== undefined) setPath(job, path, gen(rng));
    } else if (r < 0.55) setPath(job, pick(rng, PATHS), hostileValue(rng));
    else if (r < 0.7) deletePath(job, pick(rng, PATHS));
    else if (r < 0.85) setPath(job, rng() < 0.6 ? randomKey(rng) : `${pick(rng, ['aperture', 'illumination', 'grid', 'output'])}.${randomKey(rng)}`, hostileValue(rng));
    else setPath(job, pick(rng, ['aperture.shape', 'illumination.kind', 'method', 'detector.kind']), pick(rng, WORDS));
  }
  const r = rng();
  let text = r < 0.6 ? stringify(job, { lineWidth: 0 }) : r < 0.9 ? JSON.stringify(job, null, rng() < 0.5 ? 2 : 0) : stringify(job);
  if (text === undefined) text = '';
  if (rng() < 0.15) text = damageText(rng, text);
  return text;
}

const RAW_CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e]/;
const SMALLEST_NORMAL = 2.2250738585072014e-308;

/** Every number in an expanded case (and its path), for the finiteness check. */
function numbersOf(v: unknown, path: string, out: [string, number][]): void {
  if (typeof v === 'number') out.push([path, v]);
  else if (Array.isArray(v)) v.forEach((x, i) => numbersOf(x, `${path}[${i}]`, out));
  else if (v !== null && typeof v === 'object') for (const [k, x] of Object.entries(v)) numbersOf(x, `${path}.${k}`, out);
}

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'spotcast-fuzz-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe(`fuzz: ${INPUTS} malformed jobs (seed ${SEED})`, () => {
  it('each is refused cleanly, naming a key or a line, or loads, expands to finite values and plans; each in under 10 s', async () => {
    const rng = mulberry32(SEED);
    const bad: string[] = [];
    const slow: [number, string][] = [];
    const tally = { refused: 0, tooManyCases: 0, loaded: 0, planned: 0, planRefused: 0 };
    for (let i = 0; i < INPUTS; i++) {
      const text = generate(rng);
      const label = `#${i} ${JSON.stringify(text.length > 300 ? text.slice(0, 300) + '…' : text)}`;
      const t0 = performance.now();
      let loaded: LoadedJob | undefined;
      try {
        if (i % 10 === 0) {
          const file = join(dir, `fuzz-${i}.yaml`);
          await writeFile(file, text);
          loaded = await loadJobFile(file);
        } else {
          loaded = parseJobText(text, 'fuzz.yaml');
        }
      } catch (e) {
        tally.refused++;
        if (!(e instanceof JobError)) {
          bad.push(`${label}: not a JobError: ${String((e as Error)?.stack ?? e).slice(0, 400)}`);
          continue;
        }
        const msg = e.message;
        if (msg.length > 8000) bad.push(`${label}: message of ${msg.length} characters`);
        for (const line of msg.split('\n')) if (RAW_CONTROL.test(line)) bad.push(`${label}: raw control character in ${JSON.stringify(line.slice(0, 200))}`);
        if (/\n\s+at /.test(msg)) bad.push(`${label}: a stack trace in the message`);
        for (const p of e.problems) {
          if (p.path !== '' || p.line !== undefined) continue;
          // Problems of the whole file name the file and no line, as there is none to name: its
          // size, its reading, a document that is not a mapping at all, or an alias bomb; and the
          // count of problems not listed.
          const wholeFile = /^(the job text is \d+ characters|cannot read the job file: |expected a job: a mapping|cannot read the document: |and \d+ more problems? )/;
          if (!wholeFile.test(p.message)) bad.push(`${label}: a problem with neither key nor line: ${p.message.slice(0, 200)}`);
        }
      }
      if (loaded) {
        tally.loaded++;
        let cases: Case[] = [];
        try {
          cases = expandJob(loaded.spec);
        } catch (e) {
          const msg = (e as Error).message;
          if (/^the sweeps make \d+ cases, more than the \d+ one job may hold; split the job$/.test(msg)) tally.tooManyCases++;
          else bad.push(`${label}: expansion threw: ${msg.slice(0, 300)}`);
        }
        const picks = new Set<number>();
        for (let k = 0; k < PLANNED_PER_JOB && cases.length > 0; k++) picks.add(Math.round((k * (cases.length - 1)) / (PLANNED_PER_JOB - 1)));
        for (const k of picks) {
          const c = cases[k]!;
          const nums: [string, number][] = [];
          numbersOf(c, 'case', nums);
          for (const [path, x] of nums) {
            if (!Number.isFinite(x) || (x !== 0 && Math.abs(x) < SMALLEST_NORMAL)) bad.push(`${label}: case ${k} ${path} = ${x}`);
          }
          try {
            const plan = planCase(c);
            tally.planned++;
            if (plan.error) tally.planRefused++;
          } catch (e) {
            bad.push(`${label}: planCase threw on case ${k} (${c.id}): ${String((e as Error)?.stack ?? e).split('\n').slice(0, 3).join(' | ')}`);
          }
        }
        for (const w of loaded.warnings) {
          if (RAW_CONTROL.test(w.message) || w.message.length > 1000) bad.push(`${label}: warning not safe: ${w.message.slice(0, 200)}`);
        }
      }
      const ms = performance.now() - t0;
      if (process.env.FUZZ_PROFILE) slow.push([ms, label.slice(0, 160)]);
      if (ms > 10_000) bad.push(`${label}: took ${(ms / 1000).toFixed(1)} s`);
    }
    console.log(`fuzz tally: ${JSON.stringify(tally)}`);
    if (process.env.FUZZ_PROFILE) console.log(slow.sort((a, b) => b[0] - a[0]).slice(0, 25).map(([ms, l]) => `${ms.toFixed(0)} ms ${l}`).join('\n'));
    // The mix reaches every outcome: refusals, valid jobs that plan, and planner refusals.
    expect(tally.refused).toBeGreaterThan(INPUTS / 4);
    expect(tally.loaded).toBeGreaterThan(INPUTS / 10);
    expect(tally.planned).toBeGreaterThan(INPUTS / 10);
    expect(bad, bad.join('\n\n')).toEqual([]);
  });
});
