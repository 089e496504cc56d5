// The team's helper threads run the compiled program (dist/, made by npm run build), so these tests
// load the compiled modules, all from one place, so that the fft2 they call is the one the team
// takes over. Types come from the sources.
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = fileURLToPath(new URL('../../dist/src/', import.meta.url));

export function distFile(path: string): string {
  return `${root}${path}`;
}

export async function fromDist<T>(path: string): Promise<T> {
  const file = distFile(path);
  if (!existsSync(file)) throw new Error(`${file} is missing: run npm run build`);
  return (await import(pathToFileURL(file).href)) as T;
}

export type TeamModule = typeof import('../../src/parallel/fft-team.js');
export type EngineModule = typeof import('../../src/optics/engine.js');
export type FastModule = typeof import('../../src/optics/fft-fast.js');
export type FieldModule = typeof import('../../src/optics/field.js');
export type KernelsModule = typeof import('../../src/kernels.js');
export type RunJobModule = typeof import('../../src/run/run-job.js');
export type LoadModule = typeof import('../../src/job/load.js');
