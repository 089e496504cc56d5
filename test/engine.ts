// The engine the tests propagate with, made as the program's entry points make theirs (createEngine:
// the WebAssembly FFT kernel when built, else the TypeScript one), and a case context on it.
import { createEngine } from '../src/kernels.js';
import type { Engine } from '../src/optics/engine.js';
import { newCaseContext, type CaseContext } from '../src/run/context.js';
import type { PlannerOptions } from '../src/plan/planner.js';

export const engine: Engine = createEngine();

/** A fresh context (nothing kept, empty search cache) on the tests' engine. */
export function testContext(opts: PlannerOptions = {}): CaseContext {
  return newCaseContext(engine, opts);
}
