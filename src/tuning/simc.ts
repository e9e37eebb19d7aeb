import { TUNING_DEFAULTS } from './defaults.js';
import { reduceByHalfRule } from './half-rule.js';
import { ruleNotApplicable } from './not-applicable.js';
import { parameterRequired, requirePositive } from './parameter-required.js';
import { ruleFormToParallel } from './rule-form.js';
import type { ControllerType, DesignModel, RuleForm, RuleParameters, RuleResult, TuningRule } from './types.js';

const CITATION = 'Skogestad, S. (2003). Simple analytic rules for model reduction and PID controller tuning. J. Process Control 13, 291–309 — SIMC rules';

/** The lags SIMC keeps for a plant class and controller type; the half rule folds the rest. */
function retainedLags(integrators: number, controllerType: ControllerType): number {
  if (integrators === 2) return 0;
  if (integrators === 1) return controllerType === 'PID' ? 1 : 0;
  return controllerType === 'PID' ? 2 : 1;
}

/** SIMC's default controller per plant: PI for FOPDT and pure integrators, PID (series) otherwise. */
function defaultControllerType(model: DesignModel): ControllerType {
  if (model.integrators === 2) return 'PID';
  const lags = model.lags_s.filter((lag) => lag > 0).length;
  if (model.integrators === 1) return lags >= 1 ? 'PID' : 'PI';
  return lags >= 2 ? 'PID' : 'PI';
}

/**
 * SIMC (Skogestad 2003), series form Kc(1 + 1/(τI s))(1 + τD s), with τc the closed-loop time
 * constant (default τc = θ) and the model first reduced by the half rule:
 *   FOPDT K·e^(−θs)/(τ1 s + 1), PI: Kc = τ1/(K(τc + θ)), τI = min(τ1, 4(τc + θ)) (τ1 = 0, a pure
 *   delay: integral-only ki = 1/(K(τc + θ)), the limit of the same rule);
 *   second order, PID: as FOPDT plus τD = τ2;
 *   integrating k'·e^(−θs)/s, PI: Kc = 1/(k'(τc + θ)), τI = 4(τc + θ) (PID with a lag τ2: τD = τ2);
 *   double integrating k''·e^(−θs)/s², PID: Kc = 1/(4k''(τc + θ)²), τI = τD = 4(τc + θ).
 * The parallel gains follow from series → ideal (docs/domain.md §4). P-only is not a SIMC row.
 */
export function simc(model: DesignModel, parameters: RuleParameters): RuleResult {
  const controllerType = parameters.controllerType ?? defaultControllerType(model);
  if (controllerType === 'P') {
    throw ruleNotApplicable('simc', model, 'SIMC gives PI and PID settings only; for a P controller use ziegler-nichols-step or ziegler-nichols-ultimate');
  }
  if (model.integrators === 2 && controllerType !== 'PID') {
    throw ruleNotApplicable('simc', model, 'a double integrator needs derivative action: SIMC gives PID settings only for it');
  }
  const reduction = reduceByHalfRule(model, retainedLags(model.integrators, controllerType));
  const reduced = reduction.model;
  const theta = reduced.deadTime_s;
  let tauC: number;
  if (parameters.simcClosedLoopTimeConstant_s !== undefined) {
    tauC = requirePositive('simc', 'simcClosedLoopTimeConstant_s (τc)', parameters.simcClosedLoopTimeConstant_s);
  } else {
    if (!(theta > 0)) throw parameterRequired('simc', 'a closed-loop time constant τc', 'the model has no effective dead time to default τc = θ from');
    tauC = TUNING_DEFAULTS.simcTauCPerDeadTime * theta;
  }
  const lead = model.leadTimeConstant_s ?? 0;
  if (model.integrators === 2 && lead > TUNING_DEFAULTS.negligibleLeadPerHorizon * (tauC + theta)) {
    return simcWithLead(model, parameters, { lead, tauC, theta });
  }
  const k = reduced.gain;
  const horizon = tauC + theta;
  let ruleForm: RuleForm;
  if (reduced.integrators === 2) {
    ruleForm = { form: 'series', gain: 1 / (4 * k * horizon * horizon), integralTime_s: 4 * horizon, derivativeTime_s: 4 * horizon };
  } else if (reduced.integrators === 1) {
    ruleForm = { form: 'series', gain: 1 / (k * horizon), integralTime_s: 4 * horizon, derivativeTime_s: reduced.lags_s[0] ?? 0 };
  } else {
    const tau1 = reduced.lags_s[0] ?? 0;
    if (!(tau1 > 0)) {
      // Pure delay: the FOPDT rule's limit τ1 → 0 is integral-only, ki = Kc/τI = 1/(K(τc + θ)) (Skogestad 2003).
      const ki = 1 / (k * horizon);
      return {
        rule: 'simc',
        citation: CITATION,
        controllerType: 'PI',
        gains: { kp: 0, ki, kd: 0 },
        ruleForm: { form: 'parallel', gain: 0, integralTime_s: 0, derivativeTime_s: 0 },
        designModel: reduced,
        intermediate: { tauC_s: tauC, effectiveDeadTime_s: theta, halfRuleAddedDeadTime_s: reduction.addedDeadTime_s, halfRuleAddedToLag_s: 0 },
        warnings: ['the design model is a pure delay: SIMC gives an integral-only controller (kp = 0)'],
      };
    }
    ruleForm = {
      form: 'series',
      gain: tau1 / (k * horizon),
      integralTime_s: Math.min(tau1, 4 * horizon),
      derivativeTime_s: controllerType === 'PID' ? (reduced.lags_s[1] ?? 0) : 0,
    };
  }
  return {
    rule: 'simc',
    citation: CITATION,
    controllerType,
    gains: ruleFormToParallel(ruleForm),
    ruleForm,
    designModel: reduced,
    intermediate: {
      tauC_s: tauC,
      effectiveDeadTime_s: theta,
      halfRuleAddedDeadTime_s: reduction.addedDeadTime_s,
      halfRuleAddedToLag_s: reduction.addedToRetainedLag_s,
    },
    warnings:
      (model.leadTimeConstant_s ?? 0) !== 0
        ? [
            `the design neglects the path loop's lead (T0 = ${(model.leadTimeConstant_s ?? 0).toPrecision(3)} s, preview and sideslip): the margins of the full loop include it; damping-target places the poles with it`,
          ]
        : [],
  };
}

/**
 * A double integrator with a lead k''(T0·s + 1)/s² (a path loop: preview and sideslip). SIMC's
 * double-integrator settings put the crossover near 1/(τc + θ); there the lead multiplies the loop gain by
 * about T0/(τc + θ) and the loop comes out unstable (at low speed T0 is seconds — found on every demo
 * vehicle). Following Skogestad's (2003, §3.1) treatment of a positive numerator time constant against the
 * closed-loop time constant: when T0 ≥ integratorLeadPerHorizon·(τc + θ) the lead cancels an integrator in
 * that band, k''(T0 s + 1)/s² ≈ k''T0/s, and the integrating rule applies to k' = k''·T0 (same τc); between
 * negligibleLeadPerHorizon and integratorLeadPerHorizon times (τc + θ) neither model holds and SIMC refuses.
 */
function simcWithLead(
  model: DesignModel,
  parameters: RuleParameters,
  timing: {
    /** The path loop's lead T0, s. */
    readonly lead: number;
    /** τc, s. */
    readonly tauC: number;
    /** θ of the design model, s. */
    readonly theta: number;
  },
): RuleResult {
  const { lead, tauC, theta } = timing;
  const horizon = tauC + theta;
  if (lead < TUNING_DEFAULTS.integratorLeadPerHorizon * horizon) {
    throw ruleNotApplicable(
      'simc',
      model,
      `the path loop's lead T0 = ${lead.toPrecision(3)} s (preview and sideslip) lies between ${TUNING_DEFAULTS.negligibleLeadPerHorizon}(τc + θ) = ${(TUNING_DEFAULTS.negligibleLeadPerHorizon * horizon).toPrecision(3)} s and ${TUNING_DEFAULTS.integratorLeadPerHorizon}(τc + θ) = ${(TUNING_DEFAULTS.integratorLeadPerHorizon * horizon).toPrecision(3)} s: in the band SIMC designs for the plant is neither the double integrator k''/s² nor the integrator k''·T0/s, and its double-integrator settings leave the loop unstable — use migo or damping-target, or a τc that puts T0 outside that band`,
    );
  }
  const integrating: DesignModel = { integrators: 1, gain: model.gain * lead, lags_s: model.lags_s, deadTime_s: model.deadTime_s };
  const result = simc(integrating, { ...parameters, simcClosedLoopTimeConstant_s: tauC });
  return {
    ...result,
    intermediate: { ...result.intermediate, previewLead_s: lead, doubleIntegratorGain: model.gain },
    warnings: [
      `the path loop's lead T0 = ${lead.toPrecision(3)} s is at least ${TUNING_DEFAULTS.integratorLeadPerHorizon}(τc + θ) = ${(TUNING_DEFAULTS.integratorLeadPerHorizon * horizon).toPrecision(3)} s: k''(T0·s + 1)/s² ≈ k''·T0/s over the band SIMC designs for, so the integrating rule was applied to k' = k''·T0 = ${(model.gain * lead).toPrecision(3)} (Skogestad 2003, §3.1, positive numerator time constants)`,
      ...result.warnings,
    ],
  };
}

export const SIMC: TuningRule = {
  name: 'simc',
  title: 'SIMC (Skogestad internal model control)',
  citation: CITATION,
  plantClasses: ['self-regulating', 'second-order', 'integrating', 'double-integrating'],
  parameters: ['controllerType', 'simcClosedLoopTimeConstant_s'],
  tune: (model, parameters) => simc(model, parameters),
};
