import type { DesignModel } from './types.js';

/** The ultimate point of a design model under proportional control. */
export interface UltimatePoint {
  /** Ku: the proportional gain at which the loop oscillates; its sign follows the plant gain. */
  readonly ultimateGain: number;
  /** Pu = 2π/ωu, s. */
  readonly ultimatePeriod_s: number;
  /** ωu, rad/s: where the plant's phase is −180°. */
  readonly ultimateFrequency_radps: number;
}

/** Phase of the design model at ω for a positive gain, rad (continuous, not wrapped). */
function designPhase_rad(model: DesignModel, frequency_radps: number): number {
  let phase = -model.integrators * (Math.PI / 2) - frequency_radps * model.deadTime_s;
  for (const lag of model.lags_s) phase -= Math.atan(frequency_radps * lag);
  return phase;
}

/**
 * Ku and Pu of G = K·e^(−θs)/(s^n·Π(τi s + 1)) from the model itself: ωu solves
 * −n·π/2 − Σ atan(ωτi) − ωθ = −π (the phase falls monotonically, so bisection is exact to
 * machine precision), Ku = ωu^n·Π√(1 + (ωu τi)²)/|K|·sign(K), Pu = 2π/ωu.
 * Returns null when there is no finite ultimate gain: a double integrator (phase −180° already at
 * ω → 0) or a delay-free plant whose phase never reaches −180°.
 */
export function ultimatePoint(model: DesignModel): UltimatePoint | null {
  if (model.integrators >= 2 || model.gain === 0) return null;
  const relativeDegree = model.integrators + model.lags_s.filter((lag) => lag > 0).length;
  if (model.deadTime_s <= 0 && relativeDegree <= 2) return null;
  let high = 1;
  while (designPhase_rad(model, high) > -Math.PI) {
    high *= 2;
    if (high > 1e12) return null;
  }
  let low = 0;
  for (let i = 0; i < 200 && high - low > 1e-15 * high; i++) {
    const middle = 0.5 * (low + high);
    if (designPhase_rad(model, middle) > -Math.PI) low = middle;
    else high = middle;
  }
  const frequency = 0.5 * (low + high);
  let magnitudeRatio = Math.pow(frequency, model.integrators);
  for (const lag of model.lags_s) magnitudeRatio *= Math.hypot(1, frequency * lag);
  return {
    ultimateGain: (Math.sign(model.gain) * magnitudeRatio) / Math.abs(model.gain),
    ultimatePeriod_s: (2 * Math.PI) / frequency,
    ultimateFrequency_radps: frequency,
  };
}
