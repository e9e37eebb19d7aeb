/**
 * Model drift between two schedules, from the single-track model summary each carries in
 * `provenance.model` (written by the build after a joint single-track fit):
 * { kind: 'single-track', frontCorneringStiffness_NPerRad, rearCorneringStiffness_NPerRad,
 *   actuatorLag_s, actuatorDelay_s, understeerGradient_radPerMps2 }.
 * When either schedule lacks them (lumped models), drift is "not available" — never zero.
 * When both also carry the axle distances, the characteristic speed √(L/K) follows; mass, yaw inertia
 * and axle distances are reported when both carry them.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { ModelDrift, ModelParameterDrift } from './types.js';
import { quoted } from '../core/quote.js';

/** The single-track parameters compared, in report order. */
export const MODEL_PARAMETERS = [
  'frontCorneringStiffness_NPerRad',
  'rearCorneringStiffness_NPerRad',
  'actuatorLag_s',
  'actuatorDelay_s',
  'understeerGradient_radPerMps2',
] as const;

/** Reported too when both summaries carry them (the build copies them from the vehicle file). */
export const OPTIONAL_MODEL_PARAMETERS = ['mass_kg', 'yawInertia_kgm2', 'cgToFrontAxle_m', 'cgToRearAxle_m'] as const;

const finiteNumber = (value: unknown): value is number => typeof value === 'number' && Number.isFinite(value);

/**
 * Characteristic speed √(L/K), m/s (Gillespie 1992 §6), when the summary carries the axle distances
 * and an understeering gradient K > 0; null otherwise.
 */
function characteristicSpeed(model: Readonly<Record<string, unknown>>): number | null {
  const { cgToFrontAxle_m: a, cgToRearAxle_m: b, understeerGradient_radPerMps2: k } = model;
  if (!finiteNumber(a) || !finiteNumber(b) || !finiteNumber(k) || !(k > 0)) return null;
  return Math.sqrt((a + b) / k);
}

const drift = (name: string, before: number, after: number): ModelParameterDrift => {
  const change = after - before;
  return { name, old: before, new: after, change, change_pct: before === 0 ? null : (100 * change) / Math.abs(before) };
};

function missingReason(model: Readonly<Record<string, unknown>>, which: string): string | null {
  if (model.kind !== 'single-track') {
    return `the ${which} schedule's model is ${typeof model.kind === 'string' ? quoted(model.kind) : 'not named'}, not a joint single-track fit`;
  }
  const missing = MODEL_PARAMETERS.filter((name) => !finiteNumber(model[name]));
  return missing.length === 0 ? null : `the ${which} schedule's single-track model lacks ${missing.join(', ')}`;
}

/**
 * Drift of each single-track parameter: change = new − old (the parameter's unit), change_pct =
 * 100·(new − old)/|old| (null when old = 0; |old| keeps the sign of a change readable for the
 * understeer gradient, which may be negative).
 */
export function modelDrift(old: Pick<ScheduleFile, 'provenance'>, next: Pick<ScheduleFile, 'provenance'>): ModelDrift {
  const reasons = [missingReason(old.provenance.model, 'old'), missingReason(next.provenance.model, 'new')].filter((reason) => reason !== null);
  if (reasons.length > 0) return { available: false, reason: `${reasons.join('; ')} — model drift needs both schedules built from a joint single-track fit` };
  const before = old.provenance.model;
  const after = next.provenance.model;
  const parameters: ModelParameterDrift[] = MODEL_PARAMETERS.map((name) => drift(name, before[name] as number, after[name] as number));
  const speedBefore = characteristicSpeed(before);
  const speedAfter = characteristicSpeed(after);
  if (speedBefore !== null && speedAfter !== null) parameters.push(drift('characteristicSpeed_mps', speedBefore, speedAfter));
  for (const name of OPTIONAL_MODEL_PARAMETERS) {
    const valueBefore = before[name];
    const valueAfter = after[name];
    if (finiteNumber(valueBefore) && finiteNumber(valueAfter)) parameters.push(drift(name, valueBefore, valueAfter));
  }
  return { available: true, parameters };
}
