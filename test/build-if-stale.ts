// For test files that run the built program (dist/src/cli.js, its workers): build dist/ once, and
// only when it is older than the sources. `npm run build` takes tens of seconds of CPU (the
// TypeScript compiler and the WebAssembly kernel); a file that rebuilt an already current dist/
// spent most of its time there. SPOTCAST_TEST_NO_BUILD=1 still skips the check (npm test builds first).
import { execFileSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

function files(dir: string, keep: (path: string) => boolean): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) out.push(...files(p, keep));
    else if (keep(p)) out.push(p);
  }
  return out;
}

/**
 * Why dist/ under `repo` must be built: a compiled file missing, or one older than its source, the
 * kernel older than its source, or older than the build's settings; null when dist/ is current.
 * tsc writes every output on each build, so comparing each output with its own source (and all of
 * them with tsconfig.json and package.json) finds any source edited since.
 */
export function staleBuild(repo: string): string | null {
  const mtime = (p: string) => statSync(p).mtimeMs;
  const settings = Math.max(mtime(join(repo, 'tsconfig.json')), mtime(join(repo, 'package.json')));
  const src = join(repo, 'src');
  const wasmDir = join(src, 'optics', 'wasm');
  for (const ts of files(src, (p) => p.endsWith('.ts') && !p.endsWith('.d.ts'))) {
    const inWasm = ts.startsWith(wasmDir + '/');
    const out = inWasm ? join(repo, 'dist', 'src', 'optics', 'wasm', 'fft.wasm') : join(repo, 'dist', relative(repo, ts).replace(/\.ts$/, '.js'));
    if (!existsSync(out)) return `${relative(repo, out)} is missing`;
    const t = mtime(out);
    if (t < mtime(ts)) return `${relative(repo, ts)} is newer than ${relative(repo, out)}`;
    if (t < settings) return `the build settings are newer than ${relative(repo, out)}`;
  }
  // The optional native kernel: stale when built and older than its sources (when it is not built,
  // the machine may have no compiler, and a rebuild would not make it).
  const native = join(repo, 'dist', 'native', 'spotcast-fft.node');
  if (existsSync(native)) {
    for (const c of files(join(repo, 'native'), (p) => /\.(c|h|mjs)$/.test(p))) {
      if (mtime(native) < mtime(c)) return `${relative(repo, c)} is newer than ${relative(repo, native)}`;
    }
  }
  return null;
}

/** Runs `npm run build` in `repo` when dist/ is not current (see staleBuild), unless SPOTCAST_TEST_NO_BUILD=1. */
export function buildIfStale(repo: string): void {
  if (process.env.SPOTCAST_TEST_NO_BUILD === '1') return;
  if (staleBuild(repo) !== null) execFileSync('npm', ['run', 'build'], { cwd: repo, stdio: 'pipe' });
}
