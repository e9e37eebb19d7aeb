import type { BiasMode } from './fit-step-model.js';
import type { CommandHold } from './simulate-fopdt.js';

/** Every option of identification, defaulted in one place. */
export interface IdentifyOptions {
  /** Yaw-rate sensor offset: fitted per step, or the mean of the pre-step window. */
  readonly biasMode: BiasMode;
  /** How the logged command is taken between samples: held (what a rig writing a command at samples does; the default) or linearly interpolated. */
  readonly hold: CommandHold;
  /** Also fit second order plus dead time (with and without a zero) and choose by BIC. */
  readonly fitSecondOrder: boolean;
  /** Fit at most this long after each step's onset, s (longer holds add time, not information). */
  readonly maxHold_s: number;
  /** Refuse a step fit whose R² is below this. */
  readonly minR2: number;
  /** Refuse a step whose steady yaw-rate change is less than this many times the yaw-rate noise (standard deviation). */
  readonly minSignalToNoise: number;
  /** Refuse a step whose gain 95 % interval half-width exceeds this fraction of the gain. */
  readonly maxRelativeGainInterval: number;
  /** Steps whose mean speeds differ by at most min(speedTolerance_mps, speedToleranceFraction × speed) from a group's lowest are the same nominal speed. */
  readonly speedTolerance_mps: number;
  readonly speedToleranceFraction: number;
  /** Warn when left and right gains at one speed differ by more than this, % of their mean. */
  readonly asymmetryWarning_pct: number;
  /** Warn when repeats at one speed spread (max − min) by more than this, % of their mean gain. */
  readonly repeatSpreadWarning_pct: number;
  /** Warn when the joint single-track model's steady gain misses a speed's FOPDT gain by more than this, %. */
  readonly jointMismatchWarning_pct: number;
  /** Fit the joint single-track model across all speeds. */
  readonly jointFit: boolean;
}

/** Defaults of identification (hold, quality gates, speed grouping, warnings), in one place. */
export const IDENTIFY_DEFAULTS: IdentifyOptions = {
  biasMode: 'fitted',
  hold: 'zeroOrder',
  fitSecondOrder: true,
  maxHold_s: 10,
  minR2: 0.8,
  minSignalToNoise: 5,
  maxRelativeGainInterval: 0.25,
  speedTolerance_mps: 0.5,
  speedToleranceFraction: 0.05,
  asymmetryWarning_pct: 10,
  repeatSpreadWarning_pct: 15,
  jointMismatchWarning_pct: 10,
  jointFit: true,
};
