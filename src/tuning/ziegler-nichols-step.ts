import { TUNING_DEFAULTS } from './defaults.js';
import { reduceByHalfRule } from './half-rule.js';
import { ruleNotApplicable } from './not-applicable.js';
import { plantClassOf } from './plant-class.js';
import { ruleFormToParallel } from './rule-form.js';
import type { ControllerType, DesignModel, RuleForm, RuleParameters, RuleResult, TuningRule } from './types.js';

const CITATION =
  'Ziegler, J. G. & Nichols, N. B. (1942). Optimum settings for automatic controllers. Trans. ASME 64, 759–768 — step-response (reaction-curve) method';

/** Maximum slope R (per unit step) and apparent dead time L (s) of a design model's step response. */
export interface ReactionCurve {
  readonly maximumSlope: number;
  readonly apparentDeadTime_s: number;
}

/**
 * R and L of the unit step response, from the model in closed form:
 * - K·e^(−θs)/(τs + 1): R = K/τ, L = θ (so a = R·L = Kθ/τ);
 * - K·e^(−θs)/((τ1 s + 1)(τ2 s + 1)): tangent at the inflection t* = τ1τ2·ln(τ1/τ2)/(τ1 − τ2)
 *   (t* = τ for equal lags), R = y'(t*), L = θ + t* − y(t*)/R;
 * - k'·e^(−θs)/(s·Π(τi s + 1)): the response becomes the ramp k'(t − θ − Στi): R = k', L = θ + Στi.
 * Longer lag chains are first reduced to two lags by the half rule (Skogestad 2003).
 */
export function reactionCurve(model: DesignModel): ReactionCurve {
  if (model.integrators === 1) {
    return { maximumSlope: model.gain, apparentDeadTime_s: model.deadTime_s + model.lags_s.reduce((sum, lag) => sum + lag, 0) };
  }
  const lags = [...model.lags_s].sort((x, y) => y - x);
  if (lags.length <= 1) {
    const tau = lags[0] ?? 0;
    return { maximumSlope: model.gain / tau, apparentDeadTime_s: model.deadTime_s };
  }
  const reduced = reduceByHalfRule(model, 2).model;
  const [tau1, tau2] = reduced.lags_s;
  const gain = reduced.gain;
  let inflection_s: number;
  let slope: number;
  let valueAtInflection: number;
  if (tau2 <= 0) {
    return { maximumSlope: gain / tau1, apparentDeadTime_s: reduced.deadTime_s };
  } else if (Math.abs(tau1 - tau2) <= 1e-9 * tau1) {
    const tau = 0.5 * (tau1 + tau2);
    inflection_s = tau;
    slope = (gain * Math.exp(-1)) / tau;
    valueAtInflection = gain * (1 - 2 * Math.exp(-1));
  } else {
    inflection_s = (tau1 * tau2 * Math.log(tau1 / tau2)) / (tau1 - tau2);
    const e1 = Math.exp(-inflection_s / tau1);
    const e2 = Math.exp(-inflection_s / tau2);
    slope = (gain * (e1 - e2)) / (tau1 - tau2);
    valueAtInflection = gain * (1 - (tau1 * e1 - tau2 * e2) / (tau1 - tau2));
  }
  return { maximumSlope: slope, apparentDeadTime_s: reduced.deadTime_s + inflection_s - valueAtInflection / slope };
}

/**
 * Ziegler–Nichols (1942) step-response method, ideal form Kc(1 + 1/(Ti s) + Td s), with a = R·L:
 *   P: Kc = 1/a;  PI: Kc = 0.9/a, Ti = 3.3·L;  PID: Kc = 1.2/a, Ti = 2·L, Td = L/2.
 * Applies to self-regulating, second-order and integrating models; not to a double integrator
 * (its step response has no finite maximum slope).
 */
export function zieglerNicholsStep(model: DesignModel, parameters: RuleParameters): RuleResult {
  const plantClass = plantClassOf(model);
  if (plantClass === 'double-integrating') {
    throw ruleNotApplicable(
      'ziegler-nichols-step',
      model,
      'the step response of a double integrator is a parabola with no finite maximum slope, so R and L are not defined',
    );
  }
  if (model.integrators === 0 && (model.lags_s.length === 0 || model.lags_s[0] <= 0)) {
    throw ruleNotApplicable('ziegler-nichols-step', model, 'a plant without a lag has a vertical reaction curve (infinite maximum slope)');
  }
  const { maximumSlope, apparentDeadTime_s } = reactionCurve(model);
  if (!(apparentDeadTime_s > 0)) {
    throw ruleNotApplicable('ziegler-nichols-step', model, `the apparent dead time L is ${apparentDeadTime_s} s; the rule needs L > 0`);
  }
  const controllerType: ControllerType = parameters.controllerType ?? TUNING_DEFAULTS.controllerType;
  const a = maximumSlope * apparentDeadTime_s;
  const L = apparentDeadTime_s;
  const ruleForm: RuleForm =
    controllerType === 'P'
      ? { form: 'ideal', gain: 1 / a, integralTime_s: null, derivativeTime_s: 0 }
      : controllerType === 'PI'
        ? { form: 'ideal', gain: 0.9 / a, integralTime_s: 3.3 * L, derivativeTime_s: 0 }
        : { form: 'ideal', gain: 1.2 / a, integralTime_s: 2 * L, derivativeTime_s: L / 2 };
  return {
    rule: 'ziegler-nichols-step',
    citation: CITATION,
    controllerType,
    gains: ruleFormToParallel(ruleForm),
    ruleForm,
    designModel: model,
    intermediate: { maximumSlope_R: maximumSlope, apparentDeadTime_L_s: L, a },
    warnings: [],
  };
}

export const ZIEGLER_NICHOLS_STEP: TuningRule = {
  name: 'ziegler-nichols-step',
  title: 'Ziegler–Nichols step-response method',
  citation: CITATION,
  plantClasses: ['self-regulating', 'second-order', 'integrating'],
  parameters: ['controllerType'],
  tune: (model, parameters) => zieglerNicholsStep(model, parameters),
};
