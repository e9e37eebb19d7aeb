import { TUNING_DEFAULTS } from './defaults.js';
import { ruleNotApplicable } from './not-applicable.js';
import { parameterRequired, requirePositive } from './parameter-required.js';
import { plantClassOf } from './plant-class.js';
import { ruleFormToParallel } from './rule-form.js';
import type { DesignModel, RuleForm, RuleParameters, RuleResult, TuningRule } from './types.js';

const CITATION =
  'Rivera, D. E., Morari, M. & Skogestad, S. (1986). Internal model control. 4. PID controller design. Ind. Eng. Chem. Process Des. Dev. 25, 252–265 — FOPDT with first-order Padé';

/**
 * IMC-PID for K·e^(−θs)/(τs + 1) with the delay replaced by a first-order Padé approximant
 * (Rivera, Morari & Skogestad 1986), ideal form:
 *   Kc = (2τ + θ)/(K(2λ + θ)),  Ti = τ + θ/2,  Td = τθ/(2τ + θ).
 * λ (s) is the closed-loop time constant, default λ = θ; a warning when λ < 0.8θ (the paper's
 * advice for this PID, quoted from memory). Self-regulating FOPDT models only.
 */
export function imcPid(model: DesignModel, parameters: RuleParameters): RuleResult {
  if (plantClassOf(model) !== 'self-regulating') {
    throw ruleNotApplicable(
      'imc-pid',
      model,
      'the IMC-PID formulas of Rivera, Morari & Skogestad (1986) used here are derived for a first order plus dead time plant',
    );
  }
  const K = model.gain;
  const tau = model.lags_s[0] ?? 0;
  const theta = model.deadTime_s;
  let lambda: number;
  if (parameters.closedLoopTimeConstant_s !== undefined) {
    lambda = requirePositive('imc-pid', 'closedLoopTimeConstant_s (λ)', parameters.closedLoopTimeConstant_s);
  } else {
    if (!(theta > 0)) throw parameterRequired('imc-pid', 'a closed-loop time constant λ', 'the model has no dead time to default λ = θ from');
    lambda = TUNING_DEFAULTS.imcLambdaPerDeadTime * theta;
  }
  const warnings: string[] = [];
  if (lambda < TUNING_DEFAULTS.imcMinimumLambdaPerDeadTime * theta) {
    warnings.push(
      `λ = ${lambda.toPrecision(3)} s is below 0.8·θ = ${(0.8 * theta).toPrecision(3)} s, the lower limit Rivera, Morari & Skogestad (1986) advise for this PID (quoted from memory): expect poor robustness`,
    );
  }
  const ruleForm: RuleForm = {
    form: 'ideal',
    gain: (2 * tau + theta) / (K * (2 * lambda + theta)),
    integralTime_s: tau + theta / 2,
    derivativeTime_s: (tau * theta) / (2 * tau + theta),
  };
  return {
    rule: 'imc-pid',
    citation: CITATION,
    controllerType: 'PID',
    gains: ruleFormToParallel(ruleForm),
    ruleForm,
    designModel: model,
    intermediate: theta > 0 ? { lambda_s: lambda, lambdaPerDeadTime: lambda / theta } : { lambda_s: lambda },
    warnings,
  };
}

export const IMC_PID: TuningRule = {
  name: 'imc-pid',
  title: 'IMC-PID (internal model control)',
  citation: CITATION,
  plantClasses: ['self-regulating'],
  parameters: ['closedLoopTimeConstant_s'],
  tune: (model, parameters) => imcPid(model, parameters),
};
