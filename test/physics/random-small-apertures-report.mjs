// Prints every random small aperture of random-small-apertures.test.ts as it comes back, then the
// counts: `node test/physics/random-small-apertures-report.mjs [count] [seed]`. Runs the TypeScript
// sources through Vite (installed for vitest), in this process, so nothing needs building.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
const m = await server.ssrLoadModule('/test/physics/random-small-apertures.ts');
const r = await server.ssrLoadModule('/test/physics/random-cases.ts');
const count = process.argv[2] ? Number(process.argv[2]) : m.SMALL_CASE_COUNT;
const seed = process.argv[3] ? Number(process.argv[3]) : m.SMALL_SEED;
console.log(`seed ${seed}, ${count} cases`);
const all = [];
for (const d of m.drawSmallApertures(seed, count)) {
  const t = Date.now();
  const o = m.runSmallAperture(d);
  all.push(o);
  console.log((m.isSmallFailure(o) ? 'FAIL ' : '     ') + r.describeOutcome(o, false) + ` (${((Date.now() - t) / 1000).toFixed(1)} s)`);
}
const cmp = all.filter((o) => o.status === 'compared');
const unwarned = cmp.filter((o) => !o.warned);
const worst = (list) => list.reduce((w, o) => Math.max(w, o.error), 0);
console.log(`\ncompared ${cmp.length} (paraxial forms ${cmp.filter(m.isParaxialForm).length}; unwarned ${unwarned.length}, worst ${(100 * worst(unwarned)).toPrecision(3)} %, of them paraxial forms worst ${(100 * worst(unwarned.filter(m.isParaxialForm))).toPrecision(3)} %)`);
console.log(`statuses: ${[...new Set(all.map((o) => o.status))].map((s) => `${s} ${all.filter((o) => o.status === s).length}`).join(', ')}`);
console.log(`unwarned over 2 %: ${all.filter((o) => m.isSmallFailure(o, 0.02)).length}; over 5 %: ${all.filter((o) => m.isSmallFailure(o, 0.05)).length}`);
await server.close();
