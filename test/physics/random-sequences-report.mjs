// Prints every random sequence of planes of the property test random-sequences.test.ts as it comes
// back, then the counts: `node test/physics/random-sequences-report.mjs [count] [seed…]`. Runs the
// TypeScript sources through Vite (installed for vitest), so nothing needs building.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
const m = await server.ssrLoadModule('/test/physics/random-sequences.ts');
const { ACCURACY_CODES } = await server.ssrLoadModule('/src/warnings/catalogue.ts');
const count = process.argv[2] ? Number(process.argv[2]) : m.SEQUENCE_CASE_COUNT;
const seeds = process.argv.length > 3 ? process.argv.slice(3).map(Number) : [m.SEQUENCE_SEED];
const all = [];
for (const seed of seeds) {
  console.log(`seed ${seed}, ${count} cases`);
  for (const d of m.drawSequences(seed, count)) {
    const t = Date.now();
    const o = m.runSequence(d, ACCURACY_CODES);
    all.push(o);
    console.log((m.isSequenceFailure(o) ? 'FAIL ' : '     ') + m.describeSequenceOutcome(o) + ` (${((Date.now() - t) / 1000).toFixed(1)} s)`);
  }
}
console.log('\n' + m.sequenceCounts(all));
await server.close();
