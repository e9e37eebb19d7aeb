import { TUNING_DEFAULTS } from './defaults.js';
import { reduceByHalfRule } from './half-rule.js';
import { ruleNotApplicable } from './not-applicable.js';
import { ruleFormToParallel } from './rule-form.js';
import type { ControllerType, DesignModel, RuleForm, RuleParameters, RuleResult, TuningRule } from './types.js';

const CITATION =
  'Åström, K. J. & Hägglund, T. (2004). Revisiting the Ziegler–Nichols step response method for PID control. J. Process Control 14, 635–650 — AMIGO, the MIGO design (maximum integral gain with sensitivity peaks ≤ 1.4) tabulated for first order plus dead time processes';

/**
 * AMIGO (approximate M-constrained integral gain optimisation; Åström & Hägglund 2004): the MIGO design
 * (migo.ts) with M = 1.4, fitted as formulas in the FOPDT parameters K, T (lag) and L (dead time), ideal form:
 *   PI:  K·Kc = 0.15 + (0.35 − L·T/(L + T)²)·T/L,   Ti = 0.35·L + 13·L·T²/(T² + 12·L·T + 7·L²);
 *   PID: K·Kc = 0.2 + 0.45·T/L,   Ti = (0.4·L + 0.8·T)/(L + 0.1·T)·L,   Td = 0.5·L·T/(0.3·L + T).
 * For an integrating process k'·e^(−Ls)/s (T → ∞ with K/T = k') the same formulas tend to
 *   PI:  Kc = 0.35/(k'·L), Ti = 13.35·L;   PID: Kc = 0.45/(k'·L), Ti = 8·L, Td = 0.5·L
 * (the limits computed here; Åström & Hägglund 2006, Advanced PID Control, §7.6, quote 13.4·L — from memory).
 * Lags beyond the first fold into L by Skogestad's half rule. AMIGO covers processes with essentially
 * monotone step responses: a double integrator (a path loop) is outside it — use migo, which optimises the
 * same criterion on the full loop, or damping-target.
 */
export function amigo(model: DesignModel, parameters: RuleParameters): RuleResult {
  if (model.integrators === 2) {
    throw ruleNotApplicable(
      'amigo',
      model,
      'the AMIGO formulas are fitted to processes with essentially monotone step responses (self-regulating and integrating); a double integrator is outside them — migo optimises the same criterion on the full loop',
    );
  }
  const controllerType: ControllerType = parameters.controllerType ?? 'PI';
  if (controllerType === 'P') throw ruleNotApplicable('amigo', model, 'AMIGO gives PI and PID settings only');
  const reduced = reduceByHalfRule(model, model.integrators === 1 ? 0 : 1);
  const m = reduced.model;
  const L = m.deadTime_s;
  if (!(L > 0)) throw ruleNotApplicable('amigo', model, 'the AMIGO formulas need a dead time L > 0 (they divide by it)');
  const K = m.gain;
  let ruleForm: RuleForm;
  const intermediate: Record<string, number> = { deadTime_s: L, halfRuleAddedDeadTime_s: reduced.addedDeadTime_s };
  if (m.integrators === 1) {
    ruleForm =
      controllerType === 'PI'
        ? { form: 'ideal', gain: 0.35 / (K * L), integralTime_s: 13.35 * L, derivativeTime_s: 0 }
        : { form: 'ideal', gain: 0.45 / (K * L), integralTime_s: 8 * L, derivativeTime_s: 0.5 * L };
  } else {
    const T = m.lags_s[0] ?? 0;
    intermediate.timeConstant_s = T;
    intermediate.relativeDeadTime = L / (L + T);
    ruleForm =
      controllerType === 'PI'
        ? {
            form: 'ideal',
            gain: (0.15 + (0.35 - (L * T) / ((L + T) * (L + T))) * (T / L)) / K,
            integralTime_s: 0.35 * L + (13 * L * T * T) / (T * T + 12 * L * T + 7 * L * L),
            derivativeTime_s: 0,
          }
        : {
            form: 'ideal',
            gain: (0.2 + (0.45 * T) / L) / K,
            integralTime_s: ((0.4 * L + 0.8 * T) / (L + 0.1 * T)) * L,
            derivativeTime_s: (0.5 * L * T) / (0.3 * L + T),
          };
  }
  return {
    rule: 'amigo',
    citation: CITATION,
    controllerType,
    gains: ruleFormToParallel(ruleForm),
    ruleForm,
    designModel: m,
    intermediate: { ...intermediate, sensitivityPeakTarget: TUNING_DEFAULTS.sensitivityPeakTarget },
    warnings:
      (model.leadTimeConstant_s ?? 0) !== 0
        ? [`the design neglects the loop's lead (T0 = ${(model.leadTimeConstant_s ?? 0).toPrecision(3)} s); the margins of the full loop include it`]
        : [],
  };
}

export const AMIGO: TuningRule = {
  name: 'amigo',
  title: 'AMIGO (approximate M-constrained integral gain optimisation)',
  citation: CITATION,
  plantClasses: ['self-regulating', 'second-order', 'integrating'],
  parameters: ['controllerType'],
  tune: (model, parameters) => amigo(model, parameters),
};
