// Numbers in the plan's words: lengths, percentages, sizes and durations as the reasons print them.
import { formatLength, trimNumber } from '../job/units.js';
import { LIMITS } from './limits.js';

export const fmt = (x: number, d = 3) => trimNumber(x, d);
export const len = (x: number) => formatLength(x, 3);

export function pct(x: number): string {
  if (x < 1e-4) return '<0.01 %';
  return `${trimNumber(100 * x, 2)} %`;
}

export function bytes(n: number): string {
  if (!Number.isFinite(n)) return 'more than any machine holds';
  if (n >= 1024 ** 3) return `${trimNumber(n / 1024 ** 3, 3)} GiB`;
  if (n >= 1024 ** 2) return `${trimNumber(n / 1024 ** 2, 3)} MiB`;
  return `${trimNumber(n / 1024, 3)} KiB`;
}

/** Work in words, at LIMITS.workPerSecond. */
export function seconds(work: number): string {
  const s = work / LIMITS.workPerSecond;
  if (!Number.isFinite(s)) return 'no end';
  if (s < 1) return '<1 s';
  if (s < 120) return `${trimNumber(s, 2)} s`;
  if (s < 7200) return `${trimNumber(s / 60, 2)} min`;
  return `${trimNumber(s / 3600, 2)} h`;
}
