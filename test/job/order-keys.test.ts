// The orders mapping's spectroscopy keys (src/job/order-keys.ts): focal_length and use, their load
// errors by key path, and what the expander hands each case (common practice for the schema).
import { describe, expect, it } from 'vitest';
import { expandJob } from '../../src/job/expand.js';
import { parseJobText } from '../../src/job/load.js';
import { loadProblems } from '../helpers.js';

const HEAD = 'name: t\nwavelength: 633 nm\ndistance: 1 m\naperture: {shape: grating, profile: blazed, depth: 1, period: 2 um, count: 100}\n';

describe('orders.focal_length and orders.use', () => {
  it('hand each case the focal length and the range with the light: a one-wavelength job\'s light is the range', () => {
    const job = parseJobText(HEAD + "orders: {focal_length: '200 mm', use: {from: '400 nm', to: '700 nm', order: 1}}\n");
    const a = expandJob(job.spec)[0]!.analysis;
    expect(a.focalLength).toBeCloseTo(0.2, 15);
    expect(a.orderUse!.order).toBe(1);
    expect([a.orderUse!.from, a.orderUse!.to, ...a.orderUse!.light].map((v) => Math.round(v * 1e12) / 1e3)).toEqual([400, 700, 400, 700]);
  });
  it('take the light from the lowest and highest wavelength of a sweep, in any order', () => {
    const job = parseJobText(HEAD.replace('633 nm', '[650 nm, 350 nm, 500 nm]') + "orders: {use: {from: '400 nm', to: '700 nm', order: -2}}\n");
    const cases = expandJob(job.spec);
    expect(cases).toHaveLength(3);
    for (const c of cases) expect(c.analysis.orderUse!.light.map((v) => Math.round(v * 1e12) / 1e3)).toEqual([350, 650]);
  });
  it('refuse, naming the key: a range running down, order 0, a fractional order, a non-positive focal length, a wavelength out of bounds, an unknown key', () => {
    expect(loadProblems(HEAD + "orders: {use: {from: '700 nm', to: '400 nm', order: 1}}\n")[0]).toMatchObject({ path: 'orders.use.to', message: expect.stringMatching(/above 'from'/) });
    expect(loadProblems(HEAD + "orders: {use: {from: '400 nm', to: '700 nm', order: 0}}\n")[0]).toMatchObject({ path: 'orders.use.order', message: expect.stringMatching(/not 0/) });
    expect(loadProblems(HEAD + "orders: {use: {from: '400 nm', to: '700 nm', order: 1.5}}\n")[0]!.path).toBe('orders.use.order');
    expect(loadProblems(HEAD + "orders: {use: {from: '400 nm', to: '700 nm'}}\n")[0]!.path).toBe('orders.use.order');
    expect(loadProblems(HEAD + "orders: {focal_length: '-200 mm'}\n")[0]!.path).toBe('orders.focal_length');
    expect(loadProblems(HEAD + "orders: {use: {from: '0.1 nm', to: '700 nm', order: 1}}\n")[0]!.path).toBe('orders.use.from');
    expect(loadProblems(HEAD + "orders: {use: {from: '400 nm', to: '700 nm', order: 1, spacing: log}}\n")[0]!.path).toMatch(/^orders\.use/);
    expect(loadProblems(HEAD + "orders: {use: '400 nm'}\n")[0]).toMatchObject({ path: 'orders.use', message: expect.stringMatching(/from: '400 nm', to: '700 nm', order: 1/) });
  });
});

describe('the grating element\'s reflective key', () => {
  it('is absent from a transmission grating\'s case (its results do not move) and true on a reflection grating\'s', () => {
    const t = expandJob(parseJobText(HEAD).spec)[0]!.aperture as unknown as Record<string, unknown>;
    expect('reflective' in t).toBe(false);
    const r = expandJob(parseJobText(HEAD.replace('count: 100}', 'count: 100, reflective: true}')).spec)[0]!.aperture as unknown as Record<string, unknown>;
    expect(r.reflective).toBe(true);
    expect(loadProblems(HEAD.replace('count: 100}', 'count: 100, reflective: yes please}'))[0]).toMatchObject({ path: 'aperture.reflective', message: expect.stringMatching(/true \(a reflection grating\) or false/) });
  });
  it('reads a blazed depth given as a length as the groove depth h of a reflection grating: an optical path 2h·cos θ_i, in waves 2h·cos θ_i/λ', () => {
    const depthOf = (text: string) => (expandJob(parseJobText(text).spec)[0]!.aperture as unknown as { profile: { depth: number } }).profile.depth;
    const job = (extra: string, tilt: string) => `name: t\nwavelength: 600 nm\ndistance: 1 m\naperture: {shape: grating, profile: blazed, depth: '150 nm', period: 2 um, count: 100${extra}}\nillumination: {kind: plane, tilt: ['${tilt}', 0]}\n`;
    // Transmission: the length is the optical path itself, 150/600 wave.
    expect(depthOf(job('', '0 deg'))).toBeCloseTo(0.25, 12);
    expect(depthOf(job('', '30 deg'))).toBeCloseTo(0.25, 12);
    // Reflection: 2h = 300 nm at normal incidence, 2h·cos 30° at 30°.
    expect(depthOf(job(', reflective: true', '0 deg'))).toBeCloseTo(0.5, 12);
    expect(depthOf(job(', reflective: true', '30 deg'))).toBeCloseTo(0.5 * Math.cos(Math.PI / 6), 12);
    // A depth in waves is the phase itself, either way.
    expect(depthOf(job(', reflective: true', '30 deg').replace("depth: '150 nm'", 'depth: 0.8'))).toBeCloseTo(0.8, 12);
  });
});
