import { radiansToDegrees } from '../core/units.js';
import type { IdentifyOptions } from './defaults.js';
import type { FopdtFit } from './fit-fopdt.js';

/** Why a step's fit was refused: a code for machines and a sentence a user can act on. */
export interface FitRefusal {
  readonly reasonCode: 'tooSmallAgainstNoise' | 'notConverged' | 'poorFit' | 'notDetermined';
  readonly reason: string;
}

const fmt = (value: number, digits = 2): string => value.toFixed(digits);

/**
 * The quality gate of a yaw-rate FOPDT step fit. Refuses, in this order: a step whose
 * steady yaw-rate change |K·A| is under `minSignalToNoise` × the yaw-rate noise; a fit
 * that did not converge; R² under `minR2`; a gain interval wider than
 * `maxRelativeGainInterval` of the gain. Returns null when the fit passes.
 * Units: amplitude rad, noise rad/s (messages in degrees for people).
 */
export function checkYawFit(fit: FopdtFit, amplitude_rad: number, yawNoise_radps: number, options: IdentifyOptions): FitRefusal | null {
  const response_radps = Math.abs(fit.model.gain * amplitude_rad);
  const signalToNoise = yawNoise_radps > 0 ? response_radps / yawNoise_radps : Infinity;
  if (signalToNoise < options.minSignalToNoise) {
    const needed_rad = (Math.abs(amplitude_rad) * options.minSignalToNoise) / Math.max(signalToNoise, 1e-9);
    return {
      reasonCode: 'tooSmallAgainstNoise',
      reason:
        `step too small against noise: amplitude ${fmt(radiansToDegrees(Math.abs(amplitude_rad)))}°, ` +
        `yaw noise ${fmt(radiansToDegrees(yawNoise_radps))}°/s against a response of ${fmt(radiansToDegrees(response_radps))}°/s ` +
        `(needed ${options.minSignalToNoise}×); repeat with ≥ ${fmt(radiansToDegrees(needed_rad), 1)}°`,
    };
  }
  if (fit.fit.stopReason !== 'converged') {
    const why = fit.fit.stopReason === 'iterationCap' ? `stopped at the iteration cap (${fit.fit.iterations} iterations)` : 'the model gave non-finite values';
    return {
      reasonCode: 'notConverged',
      reason: `the FOPDT fit did not converge: ${why} — check that the step holds long enough for the yaw rate to settle`,
    };
  }
  if (!(fit.fit.quality.r2 >= options.minR2)) {
    return {
      reasonCode: 'poorFit',
      reason:
        `the FOPDT model explains only R² = ${fmt(fit.fit.quality.r2, 3)} of the yaw response (needed ≥ ${options.minR2}) — ` +
        'look for a speed change, a disturbance or steering at the actuator limit during the step, or drop it',
    };
  }
  const gainHalfWidth = (fit.fit.uncertainty.upper95[0] - fit.fit.uncertainty.lower95[0]) / 2;
  const relative = gainHalfWidth / Math.max(Math.abs(fit.model.gain), 1e-12);
  if (!fit.fit.uncertainty.identifiable || !(relative <= options.maxRelativeGainInterval)) {
    return {
      reasonCode: 'notDetermined',
      reason:
        `the yaw gain is not determined: 95 % interval ±${fmt(100 * relative, 0)} % (allowed ±${fmt(100 * options.maxRelativeGainInterval, 0)} %) — ` +
        'use a larger step or hold it longer',
    };
  }
  return null;
}
