import { STANDARD_GRAVITY_MPS2 } from '../core/units.js';
import type { StepTest } from '../log/types.js';
import type { SingleTrackParameters, Vehicle } from '../vehicle/types.js';
import { characteristicSpeed_mps, criticalSpeed_mps, understeerGradient_radPerMps2 } from '../vehicle/single-track.js';
import type { SpeedModel } from './aggregate.js';
import type { ActuatorIdentification } from './actuator.js';
import type { FitRefusal } from './quality-gate.js';
import { fitLeastSquares, LEAST_SQUARES_DEFAULTS, type StopReason } from './least-squares.js';
import { compareWithSpeeds, type SpeedComparison } from './joint-single-track-comparison.js';
import { jointModel, jointParameters, stackSteps, type StackedSteps } from './joint-single-track-model.js';
import { numericalJacobian, parameterUncertainty, type ParameterUncertainty } from './uncertainty.js';

export type { SpeedComparison } from './joint-single-track-comparison.js';

/**
 * Joint single-track fit over all steps at all speeds. Mass, yaw inertia and axle
 * positions come from the vehicle file; the fit finds the axle cornering stiffnesses
 * Cf, Cr (N/rad), the actuator lag τa and delay θa (s), and one yaw-rate offset per step.
 * Each step is simulated exactly (command held between samples) through
 *   e^(−θa s)/(τa s + 1) · (b1 s + b0)/(s² + a1 s + a0)
 * with the single-track coefficients at the step's speed (vehicle/single-track.ts;
 * docs/domain.md §3; Gillespie 1992, Rajamani 2012). Positivity by reparametrisation: the
 * fitted parameters are ln Cf, ln Cr, τa, θa. The per-step offsets are solved exactly
 * (the mean residual of each step: variable projection), so the fitter sees 4 parameters
 * (the model: joint-single-track-model.ts). Intervals: from the Jacobian (uncertainty.ts),
 * exponentiated for Cf and Cr, and by the delta method for the understeer gradient
 * K = (m/L)(b/Cf − a/Cr). Each speed's FOPDT model is compared with the joint model
 * (joint-single-track-comparison.ts).
 */

export interface SingleTrackFit {
  readonly parameters: SingleTrackParameters;
  readonly ci95: {
    readonly frontCorneringStiffness_NPerRad: readonly [number, number];
    readonly rearCorneringStiffness_NPerRad: readonly [number, number];
    readonly actuatorLag_s: readonly [number, number];
    readonly actuatorDelay_s: readonly [number, number];
    readonly understeerGradient_radPerMps2: readonly [number, number];
  };
  readonly understeerGradient_radPerMps2: number;
  readonly characteristicSpeed_mps: number | null;
  readonly criticalSpeed_mps: number | null;
  readonly r2: number;
  readonly rmse: number;
  readonly stepCount: number;
  readonly stopReason: StopReason;
  readonly comparison: readonly SpeedComparison[];
  readonly warnings: readonly string[];
}

/** Starts, bounds and scales of the joint fit, and when it warns (our choice unless a field says otherwise). */
export const JOINT_SINGLE_TRACK_FIT_DEFAULTS = {
  /** Normalised axle cornering stiffness for a start when the vehicle file has none: C ≈ 10 × axle load per rad (common practice for road tyres; from memory). */
  startStiffnessPerLoad: 10,
  /** Actuator lag and delay to start from when neither the actuator fit nor the vehicle file gives them, s. */
  startActuatorLag_s: 0.05,
  startActuatorDelay_s: 0.05,
  /** The smallest actuator lag a start may have, s. */
  startActuatorLagFloor_s: 0.005,
  /** Bounds of Cf and Cr, N/rad (searched as their logarithms). */
  corneringStiffnessMin_NPerRad: 10,
  corneringStiffnessMax_NPerRad: 1e8,
  /** Bounds of τa and θa, s. */
  actuatorLagMin_s: 0.001,
  actuatorLagMax_s: 1,
  actuatorDelayMin_s: 0,
  actuatorDelayMax_s: 0.5,
  /** Scales of ln Cf, ln Cr, τa (s), θa (s) for the fitter's steps. */
  scale: [1, 1, 0.05, 0.05],
  /** Levenberg–Marquardt iterations at the most. */
  maxIterations: 100,
  /** A speed is explained poorly when the joint model's RMS residual there exceeds this multiple of the per-step FOPDT fits'. */
  rmseWarningFactor: 2,
} as const;
const JOINT = JOINT_SINGLE_TRACK_FIT_DEFAULTS;

/** Fitted parameters: ln Cf, ln Cr, τa, θa. */
const PARAMETER_COUNT = 4;

/** What the joint fit takes. */
export interface SingleTrackFitInput {
  readonly vehicle: Vehicle;
  /** The steps used, at every speed. */
  readonly steps: readonly StepTest[];
  /** Each speed's FOPDT model (for the start and the comparison). */
  readonly speeds: readonly SpeedModel[];
  /** The identified actuator, when there was one (for the start). */
  readonly actuator: ActuatorIdentification | null;
  /** Warn where the joint model's steady yaw gain misses a speed's FOPDT gain by more than this, %. */
  readonly mismatchWarning_pct: number;
}

/** The start [ln Cf, ln Cr, τa, θa]: the vehicle file's stiffnesses, else from the steady gains; the actuator fit's lag and delay, else the file's. */
function startParameters(vehicle: Vehicle, speeds: readonly SpeedModel[], actuator: ActuatorIdentification | null): number[] {
  const a = vehicle.cgToFrontAxle_m;
  const b = vehicle.cgToRearAxle_m;
  const L = a + b;
  let cf = vehicle.frontCorneringStiffness_NPerRad;
  let cr = vehicle.rearCorneringStiffness_NPerRad;
  if (cf === undefined || cr === undefined) {
    // Understeer gradient from the steady gains: 1/G = L/v + K·v (docs/domain.md §3), averaged over speeds.
    const k = speeds.reduce((sum, s) => sum + (s.speed_mps / s.model.gain - L) / (s.speed_mps * s.speed_mps), 0) / speeds.length;
    cr = JOINT.startStiffnessPerLoad * vehicle.mass_kg * STANDARD_GRAVITY_MPS2 * (a / L);
    const inverseCf = (k * L) / vehicle.mass_kg / b + a / (b * cr);
    cf = inverseCf > 0 ? 1 / inverseCf : JOINT.startStiffnessPerLoad * vehicle.mass_kg * STANDARD_GRAVITY_MPS2 * (b / L);
  }
  const lag = actuator?.lag_s.value ?? vehicle.actuatorLag_s ?? JOINT.startActuatorLag_s;
  const delay = actuator?.delay_s.value ?? vehicle.actuatorDelay_s ?? JOINT.startActuatorDelay_s;
  return [Math.log(cf), Math.log(cr), Math.max(lag, JOINT.startActuatorLagFloor_s), Math.max(delay, 0)];
}

/** The largest |measured yaw rate| (at least 1e−9), the fitter's residual scale. */
function residualScaleOf(data: Float64Array): number {
  let residualScale = 0;
  for (let i = 0; i < data.length; i++) residualScale = Math.max(residualScale, Math.abs(data[i]));
  return Math.max(residualScale, 1e-9);
}

/** R², RMS residual and the lag-1 autocorrelation of the residuals (for the effective sample size) of the joint fit. */
function residualStatistics(data: Float64Array, prediction: Float64Array, ssr: number): { r2: number; rmse: number; lag1Correlation: number } {
  const total = data.length;
  let mean = 0;
  for (let i = 0; i < total; i++) mean += data[i];
  mean /= total;
  let sst = 0;
  for (let i = 0; i < total; i++) sst += (data[i] - mean) ** 2;
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < total; i++) c0 += (data[i] - prediction[i]) ** 2;
  for (let i = 1; i < total; i++) c1 += (data[i] - prediction[i]) * (data[i - 1] - prediction[i - 1]);
  return { r2: 1 - ssr / sst, rmse: Math.sqrt(ssr / total), lag1Correlation: c0 > 0 ? c1 / c0 : 0 };
}

/**
 * Half-width of the 95 % interval of the understeer gradient K(ln Cf, ln Cr) by the delta method:
 * ∂K/∂lnCf = −(m/L)·b/Cf, ∂K/∂lnCr = (m/L)·a/Cr, scaled like the intervals of the parameters.
 */
function understeerHalfWidth(params: SingleTrackParameters, p: readonly number[], uncertainty: ParameterUncertainty): number {
  const m = params.mass_kg;
  const a = params.cgToFrontAxle_m;
  const b = params.cgToRearAxle_m;
  const L = a + b;
  const gf = (-(m / L) * b) / params.frontCorneringStiffness_NPerRad;
  const gr = ((m / L) * a) / params.rearCorneringStiffness_NPerRad;
  const cov = uncertainty.covariance;
  const varianceK = gf * gf * cov[0] + 2 * gf * gr * cov[1] + gr * gr * cov[5];
  return ((uncertainty.upper95[0] - p[0]) / Math.max(uncertainty.standardErrors[0], 1e-300)) * Math.sqrt(Math.max(varianceK, 0));
}

/** Uncertainty of the fitted parameters; the per-step offsets are fitted too, so they count in the degrees of freedom (via the SSR scaling). */
function jointUncertainty(
  stacked: StackedSteps,
  model: (p: readonly number[]) => Float64Array,
  p: readonly number[],
  ssr: number,
  lag1Correlation: number,
): ParameterUncertainty {
  const { total, steps } = stacked;
  const jacobian = numericalJacobian(model, p, JOINT.scale);
  return parameterUncertainty(p, jacobian.columns, (ssr * (total - PARAMETER_COUNT)) / Math.max(1, total - PARAMETER_COUNT - steps.length), lag1Correlation);
}

/** Fit Cf, Cr, τa, θa to all steps (method in the file comment); a refusal when the fit fails or is not determined. */
export function fitSingleTrack(input: SingleTrackFitInput): SingleTrackFit | FitRefusal {
  const { vehicle, steps, speeds, actuator, mismatchWarning_pct } = input;
  const stacked = stackSteps(steps);
  const { data } = stacked;
  const { model, jacobian } = jointModel(vehicle, stacked, JOINT.scale);
  const result = fitLeastSquares(
    {
      data,
      model,
      jacobian,
      initial: startParameters(vehicle, speeds, actuator),
      scale: JOINT.scale,
      lower: [Math.log(JOINT.corneringStiffnessMin_NPerRad), Math.log(JOINT.corneringStiffnessMin_NPerRad), JOINT.actuatorLagMin_s, JOINT.actuatorDelayMin_s],
      upper: [Math.log(JOINT.corneringStiffnessMax_NPerRad), Math.log(JOINT.corneringStiffnessMax_NPerRad), JOINT.actuatorLagMax_s, JOINT.actuatorDelayMax_s],
      residualScale: residualScaleOf(data),
    },
    { ...LEAST_SQUARES_DEFAULTS, maxIterations: JOINT.maxIterations },
  );
  if (result.stopReason !== 'converged') {
    return {
      reasonCode: 'notConverged',
      reason: `the joint single-track fit did not converge (${result.stopReason} after ${result.iterations} iterations) — check the vehicle file's mass, inertia and axle positions against the vehicle tested`,
    };
  }
  const p = result.parameters;
  const prediction = model(p);
  const { r2, rmse, lag1Correlation } = residualStatistics(data, prediction, result.ssr);
  const uncertainty = jointUncertainty(stacked, model, p, result.ssr, lag1Correlation);
  if (!uncertainty.identifiable) {
    return {
      reasonCode: 'notDetermined',
      reason: 'the steps do not determine Cf, Cr, actuator lag and delay together (singular Jacobian) — test at least two well separated speeds',
    };
  }
  const params = jointParameters(vehicle, p);
  const understeer = understeerGradient_radPerMps2(params);
  const halfK = understeerHalfWidth(params, p, uncertainty);
  const { comparison, warnings } = compareWithSpeeds({
    params,
    stacked,
    prediction,
    speeds,
    thresholds: { mismatchWarning_pct, rmseWarningFactor: JOINT.rmseWarningFactor },
  });
  return {
    parameters: params,
    ci95: {
      frontCorneringStiffness_NPerRad: [Math.exp(uncertainty.lower95[0]), Math.exp(uncertainty.upper95[0])],
      rearCorneringStiffness_NPerRad: [Math.exp(uncertainty.lower95[1]), Math.exp(uncertainty.upper95[1])],
      actuatorLag_s: [uncertainty.lower95[2], uncertainty.upper95[2]],
      actuatorDelay_s: [uncertainty.lower95[3], uncertainty.upper95[3]],
      understeerGradient_radPerMps2: [understeer - halfK, understeer + halfK],
    },
    understeerGradient_radPerMps2: understeer,
    characteristicSpeed_mps: characteristicSpeed_mps(params),
    criticalSpeed_mps: criticalSpeed_mps(params),
    r2,
    rmse,
    stepCount: steps.length,
    stopReason: result.stopReason,
    comparison,
    warnings,
  };
}
