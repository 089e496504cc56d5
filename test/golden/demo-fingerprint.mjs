// Fingerprints of the demo jobs' results, for restructuring that must not change them: the SHA-256
// of every case's intensity.npy and of its result.json less the run time (`seconds`) and the tool's
// version. Not part of the test suite (the demo jobs take minutes); run it by hand before and after
// a change that should leave results as they are:
//
//   npm run build && node test/golden/demo-fingerprint.mjs --check    compare with demo-fingerprint.json
//   node test/golden/demo-fingerprint.mjs --write                     record the current results
//
// Any difference is listed per case and file; exit code 1 then. A change that means to alter
// results records the new fingerprints in the same commit, and says why. The last bits of results
// that use the FFT depend on the kernel: they are recorded with the native kernel's AVX2+FMA path
// (npm run build on an x86-64 machine with a C compiler); its generic path and the WebAssembly
// kernel (SPOTCAST_FFT=wasm) differ from it by about 1e-15 of the peak, so on such a machine the
// cases that transform are listed as different.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));
const store = join(root, 'test/golden/demo-fingerprint.json');
const mode = process.argv[2];
if (mode !== '--check' && mode !== '--write') {
  console.error('usage: node test/golden/demo-fingerprint.mjs --check | --write');
  process.exit(2);
}

const out = mkdtempSync(join(tmpdir(), 'spotcast-demo-'));
const jobs = readdirSync(join(root, 'jobs')).filter((f) => /\.ya?ml$/.test(f)).sort().map((f) => join(root, 'jobs', f));
const run = spawnSync(process.execPath, [join(root, 'dist/src/cli.js'), 'run', ...jobs, '--out', out, '--quiet', '--workers', '1'], { stdio: 'inherit' });
if (run.status !== 0) {
  console.error(`demo run ended with exit code ${run.status}`);
  process.exit(1);
}

const sha = (buf) => createHash('sha256').update(buf).digest('hex');
/** result.json without what changes from run to run or version to version. */
function resultDigest(text) {
  const r = JSON.parse(text);
  delete r.seconds;
  if (r.tool) delete r.tool.version;
  return sha(JSON.stringify(r));
}

const now = {};
for (const job of readdirSync(out).sort()) {
  for (const c of readdirSync(join(out, job)).sort()) {
    const dir = join(out, job, c);
    if (!statSync(dir).isDirectory() || c === 'plots') continue;
    let files;
    try {
      files = { 'intensity.npy': sha(readFileSync(join(dir, 'intensity.npy'))), 'result.json': resultDigest(readFileSync(join(dir, 'result.json'), 'utf8')) };
    } catch {
      continue; // not a case folder
    }
    now[`${job}/${c}`] = files;
  }
}
rmSync(out, { recursive: true, force: true });

if (mode === '--write') {
  writeFileSync(store, JSON.stringify(now, null, 1) + '\n');
  console.log(`recorded ${Object.keys(now).length} cases in ${store}`);
  process.exit(0);
}
const was = JSON.parse(readFileSync(store, 'utf8'));
const problems = [];
for (const [k, v] of Object.entries(was)) {
  if (!now[k]) problems.push(`${k}: missing now`);
  else for (const f of Object.keys(v)) if (now[k][f] !== v[f]) problems.push(`${k}: ${f} differs`);
}
for (const k of Object.keys(now)) if (!was[k]) problems.push(`${k}: new case`);
if (problems.length) {
  console.error(`${problems.length} difference(s) from the recorded demo results:\n  ${problems.join('\n  ')}`);
  process.exit(1);
}
console.log(`all ${Object.keys(was).length} demo cases as recorded`);
