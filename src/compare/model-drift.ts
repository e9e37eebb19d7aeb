/**
 * Model drift between two schedules, from the single-track model summary each carries in
 * `provenance.model` (written by the build after a joint single-track fit):
 * { kind: 'single-track', frontCorneringStiffness_NPerRad, rearCorneringStiffness_NPerRad,
 *   actuatorLag_s, actuatorDelay_s, understeerGradient_radPerMps2 }.
 * When either schedule lacks them (lumped models), drift is "not available" — never zero.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { ModelDrift, ModelParameterDrift } from './types.js';

/** The single-track parameters compared, in report order. */
export const MODEL_PARAMETERS = [
  'frontCorneringStiffness_NPerRad',
  'rearCorneringStiffness_NPerRad',
  'actuatorLag_s',
  'actuatorDelay_s',
  'understeerGradient_radPerMps2',
] as const;

function missingReason(model: Readonly<Record<string, unknown>>, which: string): string | null {
  if (model.kind !== 'single-track') {
    return `the ${which} schedule's model is ${typeof model.kind === 'string' ? `"${model.kind}"` : 'not named'}, not a joint single-track fit`;
  }
  const missing = MODEL_PARAMETERS.filter((name) => typeof model[name] !== 'number' || !Number.isFinite(model[name]));
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
  const parameters: ModelParameterDrift[] = MODEL_PARAMETERS.map((name) => {
    const before = old.provenance.model[name] as number;
    const after = next.provenance.model[name] as number;
    const change = after - before;
    return { name, old: before, new: after, change, change_pct: before === 0 ? null : (100 * change) / Math.abs(before) };
  });
  return { available: true, parameters };
}
