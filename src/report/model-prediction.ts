/**
 * What the check model says the per-speed FOPDT fits should be, for the report's parameter plots: on the
 * joint single-track model, Smith's two-point reading of its exact step response with the actuator (the
 * reading `designModelFromSingleTrack` makes, `fopdtByTwoPoints`); on the interpolated lumped model, the
 * interpolation itself (its test-speed FOPDTs joined by straight lines).
 */
import type { CheckModel } from '../pipeline/check-model.js';
import { seriesConnection } from '../lti/transfer-function.js';
import { fopdtByTwoPoints } from '../tuning/two-point.js';
import { actuatorTransferFunction, singleTrackTransferFunctions } from '../vehicle/single-track.js';
import type { ModelPrediction } from './types.js';

/** Speeds per prediction curve. */
export const PREDICTION_SPEEDS = 25;

/** The prediction over [minimum_mps, maximum_mps]; null where the model has no stable FOPDT reading (oversteer above its critical speed). */
export function modelPrediction(model: CheckModel, minimum_mps: number, maximum_mps: number): ModelPrediction {
  const summary = model.summary;
  if (summary.kind === 'interpolated-lumped') {
    const speeds = summary.speeds;
    return {
      description: 'the check model: these FOPDT fits interpolated linearly in speed',
      speeds_mps: speeds.map((entry) => entry.speed_mps),
      gain: speeds.map((entry) => entry.gain),
      timeConstant_s: speeds.map((entry) => entry.timeConstant_s),
      deadTime_s: speeds.map((entry) => entry.deadTime_s),
    };
  }
  const speeds_mps = Array.from({ length: PREDICTION_SPEEDS }, (_, k) => minimum_mps + ((maximum_mps - minimum_mps) * k) / (PREDICTION_SPEEDS - 1));
  const readings = speeds_mps.map((speed_mps) => {
    const operatingPoint = model.modelAt(speed_mps);
    if (operatingPoint.kind !== 'single-track') return null;
    const { parameters } = operatingPoint;
    try {
      return fopdtByTwoPoints(seriesConnection(actuatorTransferFunction(parameters), singleTrackTransferFunctions(parameters, speed_mps).yawRate));
    } catch {
      return null; // no stable response to read: the curve has a gap there
    }
  });
  return {
    description: "the joint single-track fit with the actuator, read as FOPDT by Smith's two-point method",
    speeds_mps,
    gain: readings.map((reading) => reading?.gain ?? null),
    timeConstant_s: readings.map((reading) => reading?.timeConstant_s ?? null),
    deadTime_s: readings.map((reading) => reading?.deadTime_s ?? null),
  };
}
