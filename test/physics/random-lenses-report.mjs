// Prints every random lens of the property test random-lenses.test.ts as it comes back, then the
// counts: `node test/physics/random-lenses-report.mjs [count] [seed] [seed…]`. Runs the TypeScript
// sources through Vite (installed for vitest), so nothing needs building.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
const m = await server.ssrLoadModule('/test/physics/random-lenses.ts');
const { ACCURACY_CODES } = await server.ssrLoadModule('/src/warnings/catalogue.ts');
const count = process.argv[2] ? Number(process.argv[2]) : m.LENS_CASE_COUNT;
const seeds = process.argv.length > 3 ? process.argv.slice(3).map(Number) : [m.LENS_SEED];
const all = [];
for (const seed of seeds) {
  console.log(`seed ${seed}, ${count} cases`);
  for (const d of m.drawLenses(seed, count)) {
    const t = Date.now();
    const o = m.runLens(d, ACCURACY_CODES);
    all.push(o);
    console.log((m.isLensFailure(o) ? 'FAIL ' : '     ') + m.describeLensOutcome(o) + ` (${((Date.now() - t) / 1000).toFixed(1)} s)`);
  }
}
console.log('\n' + m.lensCounts(all));
await server.close();
