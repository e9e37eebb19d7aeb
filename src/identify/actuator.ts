import type { StepTest } from '../log/types.js';
import { inverseVarianceMean, type CombinedValue } from './aggregate.js';
import { fitFopdt, FOPDT_FIT_DEFAULTS, type FopdtFit } from './fit-fopdt.js';
import type { CommandHold } from './simulate-fopdt.js';
import { actuatorSignals } from './step-signals.js';

/**
 * Steering actuator identification where the road-wheel angle is logged: a first-order
 * lag with transport delay, g·e^(−θa s)/(τa s + 1), fitted per step from the command to
 * the measured angle (the FOPDT fit of fit-fopdt.ts with an angle-sensor offset), then
 * combined over the steps whose fit converged, is determined and has R² ≥ 0.9 by inverse-variance weighting
 * (aggregate.ts). g should be close to 1 for a position loop; it is reported, not forced.
 * The actuator does not depend on speed, and a rate-limited actuator makes large steps look
 * slower, so the fit uses the `maximumSteps` steps of smallest amplitude (ties: file, then step order).
 */
export interface ActuatorIdentification {
  readonly gain: CombinedValue;
  readonly lag_s: CombinedValue;
  readonly delay_s: CombinedValue;
  readonly stepCount: number;
}

/** Which steps the actuator fit uses (our choice). */
export const ACTUATOR_FIT_DEFAULTS = {
  /** A step's fit counts when it converged, is determined and explains at least this share of the variance (R²). */
  minimumR2: 0.9,
  /** Steps used for the actuator fit at most: the smallest amplitudes, where a rate limit matters least. */
  maximumSteps: 12,
} as const;

/** Actuator lag and delay from the steps that log the steer angle, or null when none does (or none fits). Units: s. */
export function identifyActuator(steps: readonly StepTest[], hold: CommandHold): ActuatorIdentification | null {
  const fits: FopdtFit[] = [];
  const chosen = steps
    .filter((step) => step.steerAngle_rad !== undefined)
    .sort((a, b) => Math.abs(a.amplitude_rad) - Math.abs(b.amplitude_rad) || a.file.localeCompare(b.file) || a.stepIndex - b.stepIndex)
    .slice(0, ACTUATOR_FIT_DEFAULTS.maximumSteps);
  for (const step of chosen) {
    const signals = actuatorSignals(step);
    if (signals === null) continue;
    const fit = fitFopdt(signals, { ...FOPDT_FIT_DEFAULTS, hold });
    if (fit.fit.stopReason === 'converged' && fit.fit.quality.r2 >= ACTUATOR_FIT_DEFAULTS.minimumR2 && fit.fit.uncertainty.identifiable) fits.push(fit);
  }
  if (fits.length === 0) return null;
  const combine = (i: number): CombinedValue =>
    inverseVarianceMean(
      fits.map((f) => f.fit.parameters[i]),
      fits.map((f) => f.fit.uncertainty.standardErrors[i]),
    );
  return { gain: combine(0), lag_s: combine(1), delay_s: combine(2), stepCount: fits.length };
}
