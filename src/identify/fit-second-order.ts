import type { FopdtModel, SecondOrderModel } from './types.js';
import { fitStepModel, type BiasMode, type StepModelFit } from './fit-step-model.js';
import { simulateSecondOrder } from './simulate-second-order.js';
import type { CommandHold } from './simulate-fopdt.js';
import type { StepSignals } from './step-signals.js';

/**
 * Second order plus dead time, K(βs + 1)e^(−θs)/(s²/ωn² + 2ζs/ωn + 1), fitted to one step
 * with or without the numerator zero β (without: β is not a parameter at all — the model is
 * reparametrised, never held by a zero finite-difference step). Simulated on the measured,
 * held or linearly interpolated input (simulate-second-order.ts). Starts come from the step's
 * FOPDT fit (the same K and θ, and ωn from matching the sum of time constants 2ζ/ωn = τ at
 * ζ = 1 and ζ = 0.6; common practice for seeding a second-order fit; the better-ranked one is
 * refined — on the three demo fleets a second run never found a lower BIC), or from a fitted
 * second-order model without zero (then one start with β = 0: the models are nested).
 */
export interface SecondOrderFit {
  readonly model: SecondOrderModel;
  readonly fit: StepModelFit;
  readonly withZero: boolean;
}

/** Starts, bounds and scales of the second-order fits (our choice, set on the synthetic and demo steps). */
export const SECOND_ORDER_FIT_DEFAULTS = {
  /** Iteration cap (β and θ trade off slowly; a capped fit is simply not chosen). */
  maxIterations: 60,
  /** The seed's sum of time constants (τ of the FOPDT, 2ζ/ωn of a second-order seed) is at least this, s. */
  seedTimeConstantFloor_s: 0.01,
  /** ζ of the two starts from an FOPDT seed (2ζ/ωn = τ at each). */
  startDampingRatios: [1, 0.6],
  /** Scales: |K| of the seed (at least gainScaleFloor), 2/τ for ωn, 1 for ζ, max(τ, zeroTimeConstantScaleFloor_s) for β, deadTimeScale_s for θ. */
  gainScaleFloor: 1e-6,
  zeroTimeConstantScaleFloor_s: 0.05,
  deadTimeScale_s: 0.05,
  /** Bounds of ωn (rad/s) and ζ; β within ± the window, θ from 0 to window · deadTimeUpperWindowFraction. */
  naturalFrequencyMin_radps: 1e-3,
  naturalFrequencyMax_radps: 1e3,
  dampingRatioMin: 0.05,
  dampingRatioMax: 20,
  deadTimeUpperWindowFraction: 0.5,
} as const;
const SECOND = SECOND_ORDER_FIT_DEFAULTS;

/** What a second-order fit of one step starts from and how it treats the data. */
export interface SecondOrderFitRequest {
  /** The step's FOPDT fit, or a second-order fit without zero (then one start with β = 0). */
  readonly seed: FopdtModel | SecondOrderModel;
  /** Fit the numerator zero β too. */
  readonly withZero: boolean;
  readonly biasMode: BiasMode;
  /** How the logged command is taken between samples. */
  readonly hold: CommandHold;
}

/** Fit the second-order model (with a zero when `withZero`), seeded from an FOPDT fit or a second-order fit without zero. Units: ωn rad/s, β and θ s. */
export function fitSecondOrder(signals: StepSignals, request: SecondOrderFitRequest): SecondOrderFit {
  const { seed, withZero, biasMode, hold } = request;
  const { time_s, input } = signals;
  const n = time_s.length;
  const window_s = time_s[n - 1] - time_s[0];
  const tau =
    seed.kind === 'fopdt'
      ? Math.max(seed.timeConstant_s, SECOND.seedTimeConstantFloor_s)
      : Math.max((2 * seed.dampingRatio) / seed.naturalFrequency_radps, SECOND.seedTimeConstantFloor_s);
  const theta = Math.max(seed.deadTime_s, 0);
  const fromFopdt = (zeta: number): number[] => (withZero ? [seed.gain, (2 * zeta) / tau, zeta, 0, theta] : [seed.gain, (2 * zeta) / tau, zeta, theta]);
  const starts =
    seed.kind === 'second-order'
      ? [withZero ? [seed.gain, seed.naturalFrequency_radps, seed.dampingRatio, 0, theta] : [seed.gain, seed.naturalFrequency_radps, seed.dampingRatio, theta]]
      : SECOND.startDampingRatios.map(fromFopdt);
  const simulate = (p: readonly number[]): Float64Array => simulateSecondOrder({ time_s, input, ...modelOf(p, withZero), hold });
  const gainScale = Math.max(Math.abs(seed.gain), SECOND.gainScaleFloor);
  const deadTimeUpper_s = window_s * SECOND.deadTimeUpperWindowFraction;
  const { naturalFrequencyMin_radps: wMin, naturalFrequencyMax_radps: wMax, dampingRatioMin: zMin, dampingRatioMax: zMax } = SECOND;
  const fit = fitStepModel(
    signals,
    {
      names: withZero
        ? ['gain', 'naturalFrequency_radps', 'dampingRatio', 'zeroTimeConstant_s', 'deadTime_s']
        : ['gain', 'naturalFrequency_radps', 'dampingRatio', 'deadTime_s'],
      simulate,
      starts,
      maxRuns: seed.kind === 'fopdt' && withZero ? 2 : 1,
      scale: withZero
        ? [gainScale, 2 / tau, 1, Math.max(tau, SECOND.zeroTimeConstantScaleFloor_s), SECOND.deadTimeScale_s]
        : [gainScale, 2 / tau, 1, SECOND.deadTimeScale_s],
      lower: withZero ? [-Infinity, wMin, zMin, -window_s, 0] : [-Infinity, wMin, zMin, 0],
      upper: withZero ? [Infinity, wMax, zMax, window_s, deadTimeUpper_s] : [Infinity, wMax, zMax, deadTimeUpper_s],
    },
    biasMode,
    SECOND.maxIterations,
  );
  return { model: modelOf(fit.parameters, withZero), fit, withZero };
}

/** The model of the fitted parameters [K, ωn, ζ, (β,) θ]: β = 0 when the fit has no zero. */
function modelOf(p: readonly number[], withZero: boolean): SecondOrderModel {
  return {
    kind: 'second-order',
    gain: p[0],
    naturalFrequency_radps: p[1],
    dampingRatio: p[2],
    zeroTimeConstant_s: withZero ? p[3] : 0,
    deadTime_s: withZero ? p[4] : p[3],
  };
}
