import { TUNING_DEFAULTS } from './defaults.js';
import { reduceByHalfRule } from './half-rule.js';
import { ruleNotApplicable } from './not-applicable.js';
import { parameterRequired, requirePositive } from './parameter-required.js';
import type { DesignModel, RuleContext, RuleParameters, RuleResult, TuningRule } from './types.js';

const CITATION =
  'Pole placement on k\'\'/s² with a parallel PID: characteristic polynomial s³ + k\'\'Kd s² + k\'\'Kp s + k\'\'Ki = (s² + 2ζωn s + ωn²)(s + p) (textbook pole placement, e.g. Åström & Murray, Feedback Systems, 2008, §10)';

/**
 * Damping-target placement on the design model k''/s² (delay and lags neglected in the design):
 *   Kd = (2ζωn + p)/k'',  Kp = (ωn² + 2ζωn·p)/k'',  Ki = ωn²·p/k'',  p = ωn/ratio,
 * so the delay-free closed loop has poles at −ζωn ± ωn√(ζ² − 1) and −p. ωn (rad/s) is given, or
 * follows from a settling distance D (m) at speed vx: ts ≈ 4/(ζωn) = D/vx → ωn = 4·vx/(ζ·D), or
 * defaults to ωn = 0.1/θ_eff. θ_eff (s) is the model's delay plus its lags by the half rule; a
 * warning when ωn·θ_eff exceeds TUNING_DEFAULTS.maximumBandwidthDelayProduct (the design then asks
 * for more bandwidth than the actuator lag and delay allow). Double-integrating plants only.
 */
export function dampingTarget(model: DesignModel, parameters: RuleParameters, context: RuleContext): RuleResult {
  if (model.integrators !== 2) {
    throw ruleNotApplicable('damping-target', model, "the placement formulas are written for the double integrator k''/s² of a path loop");
  }
  const reduced = reduceByHalfRule(model, 0).model;
  const effectiveDelay_s = reduced.deadTime_s;
  const zeta = requirePositive('damping-target', 'dampingRatio (ζ)', parameters.dampingRatio ?? TUNING_DEFAULTS.dampingRatio);
  const ratio = requirePositive('damping-target', 'integralPoleRatio (ωn/p)', parameters.integralPoleRatio ?? TUNING_DEFAULTS.integralPoleRatio);
  let omega: number;
  const extra: Record<string, number> = {};
  if (parameters.naturalFrequency_radps !== undefined) {
    omega = requirePositive('damping-target', 'naturalFrequency_radps (ωn)', parameters.naturalFrequency_radps);
  } else if (parameters.settlingDistance_m !== undefined) {
    const distance = requirePositive('damping-target', 'settlingDistance_m (D)', parameters.settlingDistance_m);
    const speed = requirePositive('damping-target', 'speed_mps (vx, for ωn = 4vx/(ζD))', context.speed_mps);
    omega = (4 * speed) / (zeta * distance);
    extra.settlingDistance_m = distance;
  } else {
    if (!(effectiveDelay_s > 0)) {
      throw parameterRequired('damping-target', 'a natural frequency ωn or a settling distance D', 'the model has no delay or lag to default ωn from');
    }
    omega = TUNING_DEFAULTS.defaultBandwidthDelayProduct / effectiveDelay_s;
  }
  const p = omega / ratio;
  const k = reduced.gain;
  const gains = {
    kp: (omega * omega + 2 * zeta * omega * p) / k,
    ki: (omega * omega * p) / k,
    kd: (2 * zeta * omega + p) / k,
  };
  const product = omega * effectiveDelay_s;
  const warnings: string[] = [];
  if (product > TUNING_DEFAULTS.maximumBandwidthDelayProduct) {
    warnings.push(
      `ωn·θ_eff = ${product.toPrecision(3)} exceeds ${TUNING_DEFAULTS.maximumBandwidthDelayProduct}: the target asks for more bandwidth than the actuator lag and delay (θ_eff = ${effectiveDelay_s.toPrecision(3)} s) allow — lengthen the settling distance or lower ωn`,
    );
  }
  return {
    rule: 'damping-target',
    citation: CITATION,
    controllerType: 'PID',
    gains,
    ruleForm: { form: 'parallel', gain: gains.kp, integralTime_s: gains.kp / gains.ki, derivativeTime_s: gains.kd / gains.kp },
    designModel: reduced,
    intermediate: {
      dampingRatio: zeta,
      naturalFrequency_radps: omega,
      integralPole_radps: p,
      effectiveDeadTime_s: effectiveDelay_s,
      bandwidthDelayProduct: product,
      ...extra,
    },
    warnings,
  };
}

export const DAMPING_TARGET: TuningRule = {
  name: 'damping-target',
  title: 'Damping-target placement',
  citation: CITATION,
  plantClasses: ['double-integrating'],
  tune: dampingTarget,
};
