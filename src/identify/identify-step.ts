import type { StepTest } from '../log/types.js';
import type { IdentifyOptions } from './defaults.js';
import { fitFopdt, FOPDT_FIT_DEFAULTS, type FopdtFit } from './fit-fopdt.js';
import { fitSecondOrder, type SecondOrderFit } from './fit-second-order.js';
import { checkYawFit, type FitRefusal } from './quality-gate.js';
import { standardDeviationOf, yawSignals } from './step-signals.js';

/** Model structures a step may be described by. */
export type ModelStructure = 'fopdt' | 'second-order' | 'second-order-zero';

/** Everything identified from one step: the fits, the BIC of each, the choice, and a refusal if any. */
export interface StepIdentification {
  readonly file: string;
  readonly stepIndex: number;
  readonly onset_s: number;
  readonly speed_mps: number;
  readonly amplitude_rad: number;
  readonly direction: 'left' | 'right';
  readonly fopdt: FopdtFit;
  readonly secondOrder: SecondOrderFit | null;
  readonly secondOrderZero: SecondOrderFit | null;
  /** BIC per structure fitted (lower is better). */
  readonly bic: Readonly<Partial<Record<ModelStructure, number>>>;
  readonly chosen: ModelStructure;
  /** Yaw-rate noise: standard deviation over the pre-step window (the FOPDT RMSE when the window is under 10 samples), rad/s. */
  readonly yawNoise_radps: number;
  readonly refusal: FitRefusal | null;
}

/**
 * Identify one step: FOPDT always; second order without a zero when asked, and with a zero
 * when the model without it leaves non-white residuals; the structure with the lowest BIC is chosen. BIC rather than AIC: with ~1,000 samples
 * per step its ln(n) ≈ 7 penalty per parameter keeps the FOPDT (which the tuning rules
 * need) unless a second-order model is clearly better, and it is consistent (picks the
 * true order as n grows; Schwarz 1978). The quality gate applies to the FOPDT fit.
 */
export function identifyStep(step: StepTest, options: IdentifyOptions): StepIdentification {
  const signals = yawSignals(step);
  const fopdt = fitFopdt(signals, { ...FOPDT_FIT_DEFAULTS, biasMode: options.biasMode, hold: options.hold });
  const secondOrder = options.fitSecondOrder
    ? fitSecondOrder(signals, { seed: fopdt.model, withZero: false, biasMode: options.biasMode, hold: options.hold })
    : null;
  // The zero is fitted only when the model without it leaves structure in the residuals (Ljung–Box
  // rejects whiteness): with white residuals the extra parameter cannot lower the BIC by more than
  // noise (on the demo logs it never did), and the fit is the slowest of the three.
  const secondOrderZero =
    secondOrder !== null && !(secondOrder.fit.stopReason === 'converged' && secondOrder.fit.quality.whiteness.white)
      ? fitSecondOrder(signals, { seed: secondOrder.model, withZero: true, biasMode: options.biasMode, hold: options.hold })
      : null;
  const bic: Partial<Record<ModelStructure, number>> = { fopdt: fopdt.fit.quality.bic };
  if (secondOrder !== null && secondOrder.fit.stopReason === 'converged') bic['second-order'] = secondOrder.fit.quality.bic;
  if (secondOrderZero !== null && secondOrderZero.fit.stopReason === 'converged') bic['second-order-zero'] = secondOrderZero.fit.quality.bic;
  let chosen: ModelStructure = 'fopdt';
  for (const structure of ['second-order', 'second-order-zero'] as const) {
    const score = bic[structure];
    if (score !== undefined && score < (bic[chosen] as number)) chosen = structure;
  }
  const yawNoise_radps = step.preStepSamples >= 10 ? standardDeviationOf(step.yawRate_radps, 0, step.preStepSamples) : fopdt.fit.quality.rmse;
  return {
    file: step.file,
    stepIndex: step.stepIndex,
    onset_s: step.onset_s,
    speed_mps: step.speed_mps,
    amplitude_rad: step.amplitude_rad,
    direction: step.direction,
    fopdt,
    secondOrder,
    secondOrderZero,
    bic,
    chosen,
    yawNoise_radps,
    refusal: checkYawFit(fopdt, step.amplitude_rad, yawNoise_radps, options),
  };
}
