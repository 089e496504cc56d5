// What a thread that computes cases owns: the engine it propagates with (FFT kernel, threads,
// allocator), the source spectrum a sweep in distance keeps between its cases, and the searches'
// results that hold for every case of a job with the same aperture and wavelength. A worker makes
// one for its life, the main thread one per run; a library caller makes its own (newCaseContext).
import type { Engine } from '../optics/engine.js';
import { newSpectrumKeeper } from '../methods/transfer-grid.js';
import type { SpectrumKeeper } from '../methods/types.js';
import type { PlannerOptions } from '../plan/planner.js';

export interface CaseContext extends PlannerOptions {
  engine: Engine;
  /** The kept source spectrum (methods/transfer-grid.ts). */
  spectra: SpectrumKeeper;
  /** The searches' results by question (run/searches.ts). */
  cache: Map<string, unknown>;
}

/** A context on `engine` with nothing kept; `opts` are the planner's limits for the searches. */
export function newCaseContext(engine: Engine, opts: PlannerOptions = {}): CaseContext {
  return { ...opts, engine, spectra: newSpectrumKeeper(), cache: new Map() };
}
