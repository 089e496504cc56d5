// The command line run as a whole child process, for the benchmarks that time it from start to
// exit (bench/run.mjs, bench/spectrum.mjs): wall time, and from a module preloaded into the child,
// its peak RSS and CPU time (user + system, all threads) from process.resourceUsage() as it exits.
// The CPU time says how much work a run was, whatever the machine's load did to its wall time.
import { spawn } from 'node:child_process';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

/** Writes the preloaded module into dir; returns its path. */
export async function writeUsagePreload(dir) {
  const preload = join(dir, 'peak-rss.mjs');
  await writeFile(
    preload,
    "import { writeFileSync } from 'node:fs';\nprocess.on('exit', () => { const u = process.resourceUsage(); writeFileSync(process.env.SPOTCAST_BENCH_RSS, JSON.stringify({ maxRSS: u.maxRSS, cpu: (u.userCPUTime + u.systemCPUTime) / 1e6 })); });\n",
  );
  return preload;
}

/** One run of `cli run jobFile --out outDir --workers N --quiet`: its wall seconds, CPU seconds and peak RSS (KiB). */
export async function runCli(cli, jobFile, outDir, workers, preload, rssFile) {
  const t0 = performance.now();
  const code = await new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', pathToFileURL(preload).href, cli, 'run', jobFile, '--out', outDir, '--workers', String(workers), '--quiet'], {
      stdio: ['ignore', 'ignore', 'inherit'],
      env: { ...process.env, SPOTCAST_BENCH_RSS: rssFile },
    });
    child.on('error', reject);
    child.on('exit', (c) => resolve(c));
  });
  const seconds = (performance.now() - t0) / 1000;
  if (code !== 0) throw new Error(`spotcast run --workers ${workers} exited with ${code}`);
  const usage = JSON.parse(await readFile(rssFile, 'utf8'));
  return { seconds, cpuSeconds: usage.cpu, maxRssKb: usage.maxRSS };
}
