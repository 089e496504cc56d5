// The scheduler never starts more threads than the machine runs at once, whatever a library caller
// asks for (the command line lowers --workers itself): a billion workers asked for on a sweep get
// the machine's count, and the note says so.
import { describe, expect, it } from 'vitest';
import { availableParallelism } from 'node:os';
import { parseJobText } from '../../src/job/load.js';
import { expandJob } from '../../src/job/expand.js';
import { planCase } from '../../src/plan/planner.js';
import { chooseParallelism, machineThreads } from '../../src/run/scheduler.js';

// An invented sweep: a 20 µm slit at 633 nm, four screen distances.
const SWEEP = 'name: slit-four\nwavelength: 633 nm\ndistance: [1 m, 2 m, 3 m, 4 m]\naperture: {shape: slit, width: 20 um}\n';

describe('chooseParallelism caps threads at the machine', () => {
  const plans = expandJob(parseJobText(SWEEP).spec).map((c) => planCase(c));
  const cores = availableParallelism();

  it('machineThreads is the machine’s count', () => {
    expect(machineThreads()).toBe(Math.max(1, cores));
  });

  it.each([1e9, 256, cores + 1])('%d asked for: at most the machine, said in the note', (asked) => {
    const p = chooseParallelism(plans, asked, 1000);
    expect(p.workers).toBeLessThanOrEqual(cores);
    expect(p.threadsPerCase).toBeLessThanOrEqual(cores);
    expect(p.workers * p.threadsPerCase).toBeLessThanOrEqual(cores);
    expect(p.note).toMatch(new RegExp(`^${asked} threads asked for; this machine runs ${cores} at once: using ${cores}`));
  });

  it('within the machine: no note about it', () => {
    const p = chooseParallelism(plans, Math.min(cores, plans.length), 1000);
    expect(p.note).not.toMatch(/asked for/);
    expect(p.workers).toBe(Math.min(cores, plans.length));
  });
});
