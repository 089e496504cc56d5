// The library API: the same job schema, planner, propagators and writers the command line uses.
// Nothing is loaded or started at import: computing takes an engine (createEngine: the WebAssembly
// FFT kernel when built, the TypeScript one otherwise, same results) in a CaseContext.
export { createEngine } from './kernels.js';
export type { Engine } from './optics/engine.js';
export { newCaseContext, type CaseContext } from './run/context.js';
export { parseQuantity, formatLength, formatAngle } from './job/units.js';
export { jobSchema, type JobSpec, type JobInput, type MethodRequest } from './job/schema.js';
export { loadJobFile, parseJobText, validateJob, JobError, type LoadedJob, type JobProblem } from './job/load.js';
export { expandJob, sweepAxes, caseCount, type SweepAxis } from './job/expand.js';
export { planCase, DEFAULT_MAX_MEMORY, type PlannerOptions } from './plan/planner.js';
export { formatPlan } from './plan/format.js';
export { LIMITS } from './plan/limits.js';
export type { Plan, Case, AxisPlan, Checks, Warning, MethodName, FresnelForm, Regime, Layout } from './plan/types.js';
export { computeCase, type ComputedCase, type Diagnostics } from './run/compute.js';
export { runPlannedCase } from './run/run-case.js';
export { runJob, runJobFile, type RunOptions, type JobOutcome } from './run/run-job.js';
export { spotMetrics, type SpotMetrics, type IntensityMap } from './analysis/metrics.js';
export { gratingOrders, type GratingOrder } from './analysis/orders.js';
export { postChecks } from './analysis/validity.js';
export { WARNING_CATALOGUE, WARNING_CODES, ACCURACY_CODES, warning, warningTitle, isAccuracyWarning, type WarningCode, type WarningDetails, type WarningEntry } from './warnings/catalogue.js';
export { writeCase, resultJson, CASE_FILES, type CaseRecord, type CaseMetrics } from './output/case-output.js';
export { encodeNpy, decodeNpy } from './output/npy.js';
export { renderIntensityPng, type PictureInput } from './output/picture.js';
export * as optics from './optics/index.js';
export { TOOL_NAME, TOOL_VERSION } from './version.js';
