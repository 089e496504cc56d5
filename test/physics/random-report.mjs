// Prints every random case of the property test (random-cases.test.ts) as it comes back, then the
// class counts: `node test/physics/random-report.mjs [count] [seed]`. Runs the TypeScript sources
// through Vite (installed for vitest), so nothing needs building.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
const m = await server.ssrLoadModule('/test/physics/random-cases.ts');
const count = process.argv[2] ? Number(process.argv[2]) : m.CASE_COUNT;
const seed = process.argv[3] ? Number(process.argv[3]) : m.SEED;
console.log(`seed ${seed}, ${count} cases, accuracy warnings: ${m.ACCURACY_WARNINGS.join(', ')}`);
const outcomes = await m.runInChildren(m.drawCases(seed, count), {
  onOutcome: (o, ms) => console.log((m.isFailure(o) ? 'FAIL ' : '     ') + m.describeOutcome(o) + ` (${(ms / 1000).toFixed(1)} s)`),
});
console.log('\n' + m.countTable(outcomes));
const failures = outcomes.filter(m.isFailure);
console.log(`\n${failures.length} case(s) more than 5 % off without an accuracy warning`);
await server.close();
