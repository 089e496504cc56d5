// The report's grating-order table and its table of method changes along a sweep: from real
// computed cases and real plans, and once end to end through a job file.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { methodChanges, orderTable, OUTSIDE_RUN_ROWS } from '../../src/report/assemble.js';
import { planCase } from '../../src/plan/planner.js';
import { runJobFile } from '../../src/run/run-job.js';
import { makeCase, nm, runCase, um } from '../helpers.js';

const lam = 633 * nm;

describe('the order table of a grating case', () => {
  // 20 slits of 4 µm on a 10 µm period at 1 m, with a window that holds only the middle orders: orders
  // ±15 land (sin θ up to 0.95), the window's 0.2 m holds about ±1, the rest lie outside it.
  const { rec } = runCase({
    wavelength: lam,
    distance: 1,
    method: 'fraunhofer',
    window: [0.2, 0.2],
    aperture: { shape: 'slits', count: 20, width: 4 * um, period: 10 * um, opaque: false },
  });
  const t = orderTable(rec);
  const orders = rec.metrics.orders!;
  const rowOf = (m: number) => t.rows.find((r) => r[0] === m);

  it('has a row of its own for every order inside the window, with its status', () => {
    const inside = orders.filter((o) => o.status === 'propagating');
    expect(inside.length).toBeGreaterThanOrEqual(3);
    for (const o of inside) expect(rowOf(o.m)![1]).toBe('propagating');
  });
  it('lists every order that lands outside the window: alone, or in a run of more than a few', () => {
    const out = orders.filter((o) => o.status === 'outside-window');
    expect(out.length).toBeGreaterThan(OUTSIDE_RUN_ROWS);
    const ranges = t.rows.filter((r) => typeof r[0] === 'string' && / … /.test(r[0])).map((r) => (r[0] as string).split(' … ').map(Number) as [number, number]);
    for (const o of out) {
      const alone = rowOf(o.m);
      const inRange = ranges.some(([a, b]) => o.m >= a && o.m <= b);
      expect(alone !== undefined || inRange, `order ${o.m}`).toBe(true);
      if (alone) expect(alone[1]).toMatch(/^outside the window \((part|all) of its interval\)$/);
    }
  });
  it('lists the evanescent orders with zero power, then what all of them carry together', () => {
    for (const o of orders.filter((k) => k.status === 'evanescent')) {
      const r = rowOf(o.m)!;
      expect(r[1]).toBe('evanescent');
      expect(r[4]).toBe('0 %');
    }
    const last = t.rows[t.rows.length - 1]!;
    expect(last[0]).toBe('all evanescent orders');
    expect(last[5]).toBe(`${Number((100 * rec.metrics.evanescentFraction!).toPrecision(4))} %`);
  });
  it('says in its note what the measured, thin-grating and flux columns are', () => {
    expect(t.note).toMatch(/Goodman/);
    expect(t.note).toMatch(/cos θ_m\/cos θ_i/);
    expect(t.note).toMatch(/Evanescent orders/);
  });
});

describe('where the method changes along a sweep', () => {
  it('names the neighbouring cases and gives the later plan’s sentence that chose its method', () => {
    // A 100 µm slit from 0.2 mm to 10 m: near field, transition and far field need different methods.
    const zs = [0.2e-3, 2e-3, 0.02, 0.2, 2, 10];
    const rows = zs.map((z, i) => ({ plan: planCase({ ...makeCase({ wavelength: lam, distance: z, aperture: { shape: 'slit', width: 100 * um, opaque: false } }), index: i, id: `z${i}` }) }));
    const changes = methodChanges(rows);
    expect(changes.length).toBeGreaterThan(0);
    for (const c of changes) {
      const a = rows.find((r) => r.plan.case.id === c.from)!.plan;
      const b = rows.find((r) => r.plan.case.id === c.to)!.plan;
      // Neighbours in sweep order, with different methods or forms.
      expect(rows.indexOf(rows.find((r) => r.plan.case.id === c.to)!)).toBe(rows.indexOf(rows.find((r) => r.plan.case.id === c.from)!) + 1);
      expect(`${a.method}/${a.form}`).not.toBe(`${b.method}/${b.form}`);
      const chose = b.reasons.find((x) => /\bchosen\b|as requested/.test(x))!;
      expect(c.why).toContain(chose);
    }
    // And no change is reported between neighbours that share method and form.
    for (let i = 1; i < rows.length; i++) {
      const same = `${rows[i - 1]!.plan.method}/${rows[i - 1]!.plan.form}` === `${rows[i]!.plan.method}/${rows[i]!.plan.form}`;
      expect(changes.some((c) => c.to === rows[i]!.plan.case.id)).toBe(!same);
    }
  });
});

describe('end to end: a grating job’s report', () => {
  let dir = '';
  afterAll(async () => {
    if (dir) await rm(dir, { recursive: true, force: true });
  });
  it('has the order tables and the method changes on the report page', async () => {
    dir = await mkdtemp(join(tmpdir(), 'spotcast-orders-'));
    // An invented bench check: a 20-line test grating, screen moved from 1 mm to 1 m.
    await writeFile(
      join(dir, 'job.yaml'),
      `name: grating-bench
wavelength: 633 nm
distance: [1 mm, 1 m]
aperture: {shape: slits, count: 20, width: 4 um, period: 10 um}
`,
    );
    const o = await runJobFile(join(dir, 'job.yaml'), { outDir: join(dir, 'out') });
    expect(o.error).toBeUndefined();
    expect(o.reportError).toBeUndefined();
    expect(o.done).toBe(2);
    const html = await readFile(join(o.folder!, 'report.html'), 'utf8');
    expect(html).toContain('Grating orders,');
    expect(html).toContain('all evanescent orders');
    // At 1 mm the orders overlap in the grating's near field and at 1 m it is far field: the two
    // plans differ, and the report says where and why.
    const summary = await readFile(join(o.folder!, 'summary.csv'), 'utf8');
    const [head, ...lines] = summary.trim().split('\n');
    const col = head!.split(',').indexOf('method');
    const used = lines.map((l) => l.split(',')[col]);
    expect(used[0]).not.toBe(used[1]);
    expect(html).toContain('Where the method changes along the sweep');
    expect(summary.split('\n')[0]).toContain('evanescent_fraction');
    // Each case's orders.csv ends with the evanescent orders' total.
    const caseId = lines[0]!.split(',')[0]!;
    const csv = (await readFile(join(o.folder!, caseId, 'orders.csv'), 'utf8')).trim().split('\n');
    expect(csv[0]).toMatch(/^m,status,outside,sin_angle,/);
    expect(csv[csv.length - 1]).toMatch(/^,all-evanescent,/);
    // Numbers are written as numbers: the formula guard (a leading apostrophe, src/output/csv.ts)
    // is for text only, so no cell that reads as a number carries it, and the negative orders'
    // m and angles are plain negative numbers.
    const cells = [...lines, ...csv.slice(1)].flatMap((l) => l.split(','));
    const guarded = cells.filter((c) => c.startsWith("'"));
    expect(guarded.filter((c) => c.slice(1) !== '' && Number.isFinite(Number(c.slice(1))))).toEqual([]);
    expect(csv.slice(1).some((l) => /^-\d+,/.test(l))).toBe(true);
  }, 60_000);
});
