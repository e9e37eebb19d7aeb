import { idealToParallel, seriesToParallel } from '../controller/pid-forms.js';
import type { PidGains } from '../controller/types.js';
import type { RuleForm } from './types.js';

/**
 * Parallel gains of a controller written in ideal or series form (docs/domain.md §4, conversions in
 * src/controller/pid-forms.ts): ideal kp = Kc, ki = Kc/Ti, kd = Kc·Td; series via ideal
 * Kc' = Kc(1 + τD/τI), Ti = τI + τD, Td = τI·τD/(τI + τD). Signs follow Kc.
 */
export function ruleFormToParallel(ruleForm: RuleForm): PidGains {
  const pid = { gain: ruleForm.gain, integralTime_s: ruleForm.integralTime_s, derivativeTime_s: ruleForm.derivativeTime_s };
  switch (ruleForm.form) {
    case 'ideal':
      return idealToParallel(pid);
    case 'series':
      return seriesToParallel(pid);
    case 'parallel':
      throw new Error('ruleFormToParallel: a parallel rule form carries its gains directly');
  }
}
