import { TUNING_DEFAULTS } from './defaults.js';
import { ruleNotApplicable } from './not-applicable.js';
import { ruleFormToParallel } from './rule-form.js';
import type { ControllerType, DesignModel, RuleForm, RuleParameters, RuleResult, TuningRule } from './types.js';
import { ultimatePoint } from './ultimate-gain.js';

const CITATION = 'Ziegler, J. G. & Nichols, N. B. (1942). Optimum settings for automatic controllers. Trans. ASME 64, 759–768 — ultimate-sensitivity method';

/**
 * Ziegler–Nichols (1942) ultimate-gain method, ideal form, with Ku and Pu computed from the model
 * at its −180° phase crossing (`ultimatePoint`):
 *   P: Kc = 0.5·Ku;  PI: Kc = 0.45·Ku, Ti = Pu/1.2;  PID: Kc = 0.6·Ku, Ti = Pu/2, Td = Pu/8.
 * Not applicable without a finite ultimate gain (a double integrator, or a delay-free plant of
 * relative degree ≤ 2).
 */
export function zieglerNicholsUltimate(model: DesignModel, parameters: RuleParameters): RuleResult {
  const ultimate = ultimatePoint(model);
  if (ultimate === null) {
    const reason =
      model.integrators >= 2
        ? 'a double integrator already has −180° of phase at zero frequency, so there is no finite ultimate gain'
        : 'the plant phase never reaches −180°, so proportional control never oscillates and there is no finite ultimate gain';
    throw ruleNotApplicable('ziegler-nichols-ultimate', model, reason);
  }
  const controllerType: ControllerType = parameters.controllerType ?? TUNING_DEFAULTS.controllerType;
  const { ultimateGain: Ku, ultimatePeriod_s: Pu } = ultimate;
  const ruleForm: RuleForm =
    controllerType === 'P'
      ? { form: 'ideal', gain: 0.5 * Ku, integralTime_s: null, derivativeTime_s: 0 }
      : controllerType === 'PI'
        ? { form: 'ideal', gain: 0.45 * Ku, integralTime_s: Pu / 1.2, derivativeTime_s: 0 }
        : { form: 'ideal', gain: 0.6 * Ku, integralTime_s: Pu / 2, derivativeTime_s: Pu / 8 };
  return {
    rule: 'ziegler-nichols-ultimate',
    citation: CITATION,
    controllerType,
    gains: ruleFormToParallel(ruleForm),
    ruleForm,
    designModel: model,
    intermediate: {
      ultimateGain_Ku: Ku,
      ultimatePeriod_Pu_s: Pu,
      ultimateFrequency_radps: ultimate.ultimateFrequency_radps,
    },
    warnings: [],
  };
}

export const ZIEGLER_NICHOLS_ULTIMATE: TuningRule = {
  name: 'ziegler-nichols-ultimate',
  title: 'Ziegler–Nichols ultimate-gain method',
  citation: CITATION,
  plantClasses: ['self-regulating', 'second-order', 'integrating'],
  parameters: ['controllerType'],
  tune: (model, parameters) => zieglerNicholsUltimate(model, parameters),
};
