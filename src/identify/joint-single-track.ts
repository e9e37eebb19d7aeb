import type { StepTest } from '../log/types.js';
import type { SingleTrackParameters, Vehicle } from '../vehicle/types.js';
import { characteristicSpeed_mps, criticalSpeed_mps, steadyStateYawGain_perS, understeerGradient_radPerMps2 } from '../vehicle/single-track.js';
import type { SpeedModel } from './aggregate.js';
import type { ActuatorIdentification } from './actuator.js';
import type { FitRefusal } from './quality-gate.js';
import { fitLeastSquares, LEAST_SQUARES_DEFAULTS, type StopReason } from './least-squares.js';
import { simulateYawThroughActuator } from './simulate-single-track-yaw.js';
import { newHoldUpdateCache } from './simulate-third-order.js';
import { yawSignals } from './step-signals.js';
import { numericalJacobian, parameterUncertainty } from './uncertainty.js';

/**
 * Joint single-track fit over all steps at all speeds. Mass, yaw inertia and axle
 * positions come from the vehicle file; the fit finds the axle cornering stiffnesses
 * Cf, Cr (N/rad), the actuator lag τa and delay θa (s), and one yaw-rate offset per step.
 * Each step is simulated exactly (command held between samples) through
 *   e^(−θa s)/(τa s + 1) · (b1 s + b0)/(s² + a1 s + a0)
 * with the single-track coefficients at the step's speed (vehicle/single-track.ts;
 * docs/domain.md §3; Gillespie 1992, Rajamani 2012). Positivity by reparametrisation: the
 * fitted parameters are ln Cf, ln Cr, τa, θa. The per-step offsets are solved exactly
 * (the mean residual of each step: variable projection), so the fitter sees 4 parameters.
 * Intervals: from the Jacobian (uncertainty.ts), exponentiated for Cf and Cr, and by the
 * delta method for the understeer gradient K = (m/L)(b/Cf − a/Cr).
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

/** The joint model against one speed's FOPDT: steady yaw gain and residuals over that speed's steps. */
export interface SpeedComparison {
  readonly speed_mps: number;
  readonly fopdtGain: number;
  readonly singleTrackGain: number;
  /** (single-track − FOPDT)/|FOPDT| × 100, %. */
  readonly difference_pct: number;
  /** RMS residual of the joint model over this speed's steps, and of the per-step FOPDT fits, rad/s. */
  readonly singleTrackRmse_radps: number;
  readonly fopdtRmse_radps: number;
}

/** The joint model explains a speed poorly when its RMS residual there exceeds this multiple of the per-step FOPDT fits' (which have 4 parameters per step). */
const RMSE_WARNING_FACTOR = 2;

/** Normalised axle cornering stiffness used for a start when the vehicle file has none: C ≈ 10 × axle load per rad (common practice for road tyres; from memory). */
const START_STIFFNESS_PER_LOAD = 10;
const GRAVITY_MPS2 = 9.80665;

function startParameters(vehicle: Vehicle, speeds: readonly SpeedModel[], actuator: ActuatorIdentification | null): number[] {
  const a = vehicle.cgToFrontAxle_m;
  const b = vehicle.cgToRearAxle_m;
  const L = a + b;
  let cf = vehicle.frontCorneringStiffness_NPerRad;
  let cr = vehicle.rearCorneringStiffness_NPerRad;
  if (cf === undefined || cr === undefined) {
    // Understeer gradient from the steady gains: 1/G = L/v + K·v (docs/domain.md §3), averaged over speeds.
    const k = speeds.reduce((sum, s) => sum + (s.speed_mps / s.model.gain - L) / (s.speed_mps * s.speed_mps), 0) / speeds.length;
    cr = START_STIFFNESS_PER_LOAD * vehicle.mass_kg * GRAVITY_MPS2 * (a / L);
    const inverseCf = (k * L) / vehicle.mass_kg / b + a / (b * cr);
    cf = inverseCf > 0 ? 1 / inverseCf : START_STIFFNESS_PER_LOAD * vehicle.mass_kg * GRAVITY_MPS2 * (b / L);
  }
  const lag = actuator?.lag_s.value ?? vehicle.actuatorLag_s ?? 0.05;
  const delay = actuator?.delay_s.value ?? vehicle.actuatorDelay_s ?? 0.05;
  return [Math.log(cf), Math.log(cr), Math.max(lag, 0.005), Math.max(delay, 0)];
}

function parametersOf(vehicle: Vehicle, p: readonly number[]): SingleTrackParameters {
  return {
    mass_kg: vehicle.mass_kg,
    yawInertia_kgm2: vehicle.yawInertia_kgm2,
    cgToFrontAxle_m: vehicle.cgToFrontAxle_m,
    cgToRearAxle_m: vehicle.cgToRearAxle_m,
    frontCorneringStiffness_NPerRad: Math.exp(p[0]),
    rearCorneringStiffness_NPerRad: Math.exp(p[1]),
    actuatorLag_s: p[2],
    actuatorDelay_s: p[3],
  };
}

/** Fit Cf, Cr, τa, θa to all steps (method in the file comment); a refusal when the fit fails or is not determined. */
export function fitSingleTrack(
  vehicle: Vehicle,
  steps: readonly StepTest[],
  speeds: readonly SpeedModel[],
  actuator: ActuatorIdentification | null,
  mismatchWarning_pct: number,
): SingleTrackFit | FitRefusal {
  const signals = steps.map(yawSignals);
  const total = signals.reduce((sum, s) => sum + s.time_s.length, 0);
  const data = new Float64Array(total);
  let offset = 0;
  for (const s of signals) {
    data.set(s.output, offset);
    offset += s.output.length;
  }
  // One state buffer for every simulation; each step is simulated straight into its part of the prediction.
  const states = new Float64Array(3 * signals.reduce((longest, s) => Math.max(longest, s.time_s.length), 0));
  const cache = newHoldUpdateCache();
  /** Yaw rate of every step at p, each step shifted by its best offset; with `delayColumn`, ∂/∂θa too. */
  const simulateAll = (p: readonly number[], delayColumn: Float64Array | null): Float64Array => {
    const params = parametersOf(vehicle, p);
    const prediction = new Float64Array(total);
    let at = 0;
    for (let i = 0; i < steps.length; i++) {
      const s = signals[i];
      const end = at + s.time_s.length;
      const derivative = delayColumn === null ? null : delayColumn.subarray(at, end);
      const y = simulateYawThroughActuator(params, steps[i].speed_mps, s.time_s, s.input, prediction.subarray(at, end), states, cache, derivative);
      // The offset is the mean residual, so it moves with the prediction: subtract the column's mean too.
      let mean = 0;
      for (let k = 0; k < y.length; k++) mean += s.output[k] - y[k];
      mean /= y.length;
      for (let k = 0; k < y.length; k++) y[k] = y[k] + mean;
      if (derivative !== null) {
        let derivativeMean = 0;
        for (let k = 0; k < derivative.length; k++) derivativeMean += derivative[k];
        derivativeMean /= derivative.length;
        for (let k = 0; k < derivative.length; k++) derivative[k] -= derivativeMean;
      }
      at = end;
    }
    return prediction;
  };
  // Each evaluation keeps its exact ∂/∂θa: the fitter asks for the Jacobian where it last evaluated.
  let last: { readonly p: readonly number[]; readonly prediction: Float64Array; readonly delayColumn: Float64Array } | null = null;
  const model = (p: readonly number[]): Float64Array => {
    const delayColumn = new Float64Array(total);
    const prediction = simulateAll(p, delayColumn);
    last = { p: p.slice(), prediction, delayColumn };
    return prediction;
  };
  const scale = [1, 1, 0.05, 0.05];
  // Jacobian: ∂/∂θa exact (simulate-third-order.ts), the others by forward differences with the
  // adapter's step rule (relative to max(|p/scale|, 1), in scaled units).
  const modelJacobian = (p: readonly number[]): readonly Float64Array[] => {
    const here = last !== null && last.p.every((v, i) => v === p[i]) ? last : null;
    const delayColumn = here?.delayColumn ?? new Float64Array(total);
    const base = here?.prediction ?? simulateAll(p, delayColumn);
    const columns: Float64Array[] = [];
    for (let i = 0; i < 3; i++) {
      const h = LEAST_SQUARES_DEFAULTS.relativeDifferenceStep * Math.max(Math.abs(p[i]) / scale[i], 1) * scale[i];
      const probe = p.slice();
      probe[i] += h;
      const column = simulateAll(probe, null);
      for (let k = 0; k < total; k++) column[k] = (column[k] - base[k]) / h;
      columns.push(column);
    }
    columns.push(delayColumn);
    return columns;
  };
  const start = startParameters(vehicle, speeds, actuator);
  let residualScale = 0;
  for (let i = 0; i < total; i++) residualScale = Math.max(residualScale, Math.abs(data[i]));
  const result = fitLeastSquares(
    { data, model, jacobian: modelJacobian, initial: start, scale, lower: [Math.log(10), Math.log(10), 0.001, 0], upper: [Math.log(1e8), Math.log(1e8), 1, 0.5], residualScale: Math.max(residualScale, 1e-9) },
    { ...LEAST_SQUARES_DEFAULTS, maxIterations: 100 },
  );
  if (result.stopReason !== 'converged') {
    return {
      reasonCode: 'notConverged',
      reason: `the joint single-track fit did not converge (${result.stopReason} after ${result.iterations} iterations) — check the vehicle file's mass, inertia and axle positions against the vehicle tested`,
    };
  }
  const p = result.parameters;
  const prediction = model(p);
  let mean = 0;
  for (let i = 0; i < total; i++) mean += data[i];
  mean /= total;
  let sst = 0;
  for (let i = 0; i < total; i++) sst += (data[i] - mean) ** 2;
  const r2 = 1 - result.ssr / sst;
  const rmse = Math.sqrt(result.ssr / total);
  // Lag-1 autocorrelation of the residuals for the effective sample size.
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < total; i++) c0 += (data[i] - prediction[i]) ** 2;
  for (let i = 1; i < total; i++) c1 += (data[i] - prediction[i]) * (data[i - 1] - prediction[i - 1]);
  const jacobian = numericalJacobian(model, p, scale);
  // The per-step offsets are fitted too: count them in the degrees of freedom via the SSR scaling.
  const uncertainty = parameterUncertainty(p, jacobian.columns, result.ssr * (total - 4) / Math.max(1, total - 4 - steps.length), c0 > 0 ? c1 / c0 : 0);
  if (!uncertainty.identifiable) {
    return {
      reasonCode: 'notDetermined',
      reason: 'the steps do not determine Cf, Cr, actuator lag and delay together (singular Jacobian) — test at least two well separated speeds',
    };
  }
  const params = parametersOf(vehicle, p);
  const m = vehicle.mass_kg;
  const a = vehicle.cgToFrontAxle_m;
  const b = vehicle.cgToRearAxle_m;
  const L = a + b;
  const understeer = understeerGradient_radPerMps2(params);
  // Delta method on K(ln Cf, ln Cr): ∂K/∂lnCf = −(m/L)·b/Cf, ∂K/∂lnCr = (m/L)·a/Cr.
  const gf = (-(m / L) * b) / params.frontCorneringStiffness_NPerRad;
  const gr = ((m / L) * a) / params.rearCorneringStiffness_NPerRad;
  const cov = uncertainty.covariance;
  const varianceK = gf * gf * cov[0] + 2 * gf * gr * cov[1] + gr * gr * cov[5];
  const halfK = (uncertainty.upper95[0] - p[0]) / Math.max(uncertainty.standardErrors[0], 1e-300) * Math.sqrt(Math.max(varianceK, 0));
  const warnings: string[] = [];
  // Residuals of the joint model per step, to compare with each speed's FOPDT fits.
  const stepSquares = new Map<string, { sum: number; count: number }>();
  let at = 0;
  steps.forEach((step, i) => {
    const length = signals[i].time_s.length;
    let sum = 0;
    for (let k = at; k < at + length; k++) sum += (data[k] - prediction[k]) ** 2;
    stepSquares.set(`${step.file}\u0000${step.stepIndex}`, { sum, count: length });
    at += length;
  });
  const comparison: SpeedComparison[] = speeds.map((s) => {
    const singleTrackGain = steadyStateYawGain_perS(params, s.speed_mps);
    const difference_pct = (100 * (singleTrackGain - s.model.gain)) / Math.abs(s.model.gain);
    let sum = 0;
    let count = 0;
    for (const key of s.steps ?? []) {
      const entry = stepSquares.get(`${key.file}\u0000${key.stepIndex}`);
      if (entry !== undefined) {
        sum += entry.sum;
        count += entry.count;
      }
    }
    const singleTrackRmse_radps = count > 0 ? Math.sqrt(sum / count) : Number.NaN;
    const where = `at ${s.speed_mps.toFixed(2)} m/s the joint single-track model`;
    if (Math.abs(difference_pct) > mismatchWarning_pct) {
      warnings.push(
        `${where}'s steady yaw gain ${singleTrackGain.toFixed(3)} 1/s misses the measured ${s.model.gain.toFixed(3)} 1/s by ${difference_pct.toFixed(1)} % ` +
          `(threshold ${mismatchWarning_pct} %) — the linear single-track model does not explain this speed: check for tyre saturation (large steps), load or surface changes`,
      );
    }
    if (singleTrackRmse_radps > RMSE_WARNING_FACTOR * s.fopdtRmse_radps) {
      warnings.push(
        `${where} leaves an RMS yaw-rate residual of ${singleTrackRmse_radps.toExponential(2)} rad/s, more than ${RMSE_WARNING_FACTOR}× the per-step FOPDT fits' ` +
          `${s.fopdtRmse_radps.toExponential(2)} rad/s — its dynamics do not match this speed: check the vehicle file's mass, inertia and axle positions`,
      );
    }
    return { speed_mps: s.speed_mps, fopdtGain: s.model.gain, singleTrackGain, difference_pct, singleTrackRmse_radps, fopdtRmse_radps: s.fopdtRmse_radps };
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
