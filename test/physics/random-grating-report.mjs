// Prints every random grating of random-grating-profiles.ts as it comes back, then the summary:
// `node test/physics/random-grating-report.mjs [count] [seed] [first]`. Runs the TypeScript sources
// through Vite (installed for vitest), in this process, one case at a time.
import { tsServer } from '../ts-loader.mjs';

const server = await tsServer();
const m = await server.ssrLoadModule('/test/physics/random-grating-profiles.ts');
const count = process.argv[2] ? Number(process.argv[2]) : m.GRATING_PROFILE_CASE_COUNT;
const seed = process.argv[3] ? Number(process.argv[3]) : m.GRATING_PROFILE_SEED;
const first = process.argv[4] ? Number(process.argv[4]) : 0;
console.log(`seed ${seed}, ${count} cases`);
const outcomes = [];
for (const d of m.drawGratings(seed, count).slice(first)) {
  const t0 = Date.now();
  const o = m.runGratingCase(d);
  outcomes.push(o);
  console.log((m.isFailure(o) ? 'FAIL ' : '     ') + m.describeOutcome(o, m.isFailure(o)) + ` (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
}
console.log('\n' + m.summary(outcomes));
await server.close();
