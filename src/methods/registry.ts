// Every propagation method and form, in the planner's order: the order options are listed in
// (and, at equal cost, preferred), and the order in which the closed forms are tried first.
import type { MethodForm, MethodName, Plan } from '../plan/types.js';
import { angularSpectrum } from './angular-spectrum.js';
import { angularSpectrumShifted } from './angular-spectrum-shifted.js';
import { farField } from './far-field.js';
import { fresnelDirect } from './fresnel-direct.js';
import { fresnelLens } from './fresnel-lens.js';
import { fresnelPlanes } from './fresnel-planes.js';
import { fresnelSingleFft } from './fresnel-single-fft.js';
import { fresnelTransfer } from './fresnel-transfer.js';
import { rayleighSommerfeldAreaCells } from './rayleigh-sommerfeld-area-cells.js';
import { rayleighSommerfeldBoundary } from './rayleigh-sommerfeld-boundary.js';
import { rayleighSommerfeldCells1D } from './rayleigh-sommerfeld-cells-1d.js';
import { rayleighSommerfeldEdgeCells } from './rayleigh-sommerfeld-edge-cells.js';
import { rayleighSommerfeldPerPeriod } from './rayleigh-sommerfeld-per-period.js';
import type { MethodDescriptor } from './types.js';

export const METHOD_REGISTRY: readonly MethodDescriptor[] = [
  farField,
  fresnelDirect,
  fresnelTransfer,
  fresnelSingleFft,
  fresnelLens,
  fresnelPlanes,
  angularSpectrum,
  angularSpectrumShifted,
  rayleighSommerfeldCells1D,
  rayleighSommerfeldPerPeriod,
  rayleighSommerfeldBoundary,
  rayleighSommerfeldAreaCells,
  rayleighSommerfeldEdgeCells,
];

/** The methods in registry order, each once. */
export const METHOD_NAMES: readonly MethodName[] = [...new Set(METHOD_REGISTRY.map((d) => d.method))];

/** The descriptor that computes a plan (its method and form, and where several share them, the one that claims it). */
export function descriptorOf(plan: Pick<Plan, 'method' | 'form'> & Partial<Plan>): MethodDescriptor {
  const d = METHOD_REGISTRY.find((m) => m.method === plan.method && m.form === plan.form && (m.claims ? m.claims(plan as Plan) : true));
  if (!d) throw new Error(`no method ${plan.method}${plan.form ? ` (${plan.form})` : ''} for this plan`);
  return d;
}

/** A method, and its form when given, in words. */
export function methodWords(m: MethodName, form?: MethodForm): string {
  const name = METHOD_REGISTRY.find((d) => d.method === m)!.words.method;
  if (!form) return name;
  const d = METHOD_REGISTRY.find((x) => x.method === m && x.form === form);
  return d?.words.form ? `${name} (${d.words.form})` : name;
}
