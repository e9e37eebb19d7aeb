import type { PidGains } from '../controller/types.js';
import type { RuleForm } from './types.js';

/**
 * Parallel gains of a controller written in ideal or series form (DOMAIN.md §4):
 *   ideal Kc(1 + 1/(Ti s) + Td s) → kp = Kc, ki = Kc/Ti, kd = Kc·Td;
 *   series Kc(1 + 1/(τI s))(1 + τD s) → ideal Kc' = Kc(1 + τD/τI), Ti = τI + τD, Td = τI·τD/(τI + τD)
 *   (no integral: Kc' = Kc, Td = τD).
 * Signs follow Kc (a negative plant gain gives negative gains); times in s.
 */
export function ruleFormToParallel(ruleForm: RuleForm): PidGains {
  const { form, gain, integralTime_s, derivativeTime_s } = ruleForm;
  if (form === 'parallel') throw new Error('ruleFormToParallel: a parallel rule form carries its gains directly');
  if (form === 'ideal') {
    return { kp: gain, ki: integralTime_s === null ? 0 : gain / integralTime_s, kd: gain * derivativeTime_s };
  }
  if (integralTime_s === null) return { kp: gain, ki: 0, kd: gain * derivativeTime_s };
  const idealGain = gain * (1 + derivativeTime_s / integralTime_s);
  const idealIntegral_s = integralTime_s + derivativeTime_s;
  const idealDerivative_s = (integralTime_s * derivativeTime_s) / (integralTime_s + derivativeTime_s);
  return { kp: idealGain, ki: idealGain / idealIntegral_s, kd: idealGain * idealDerivative_s };
}
