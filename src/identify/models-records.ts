import type { FopdtFit } from './fit-fopdt.js';
import type { SecondOrderFit } from './fit-second-order.js';
import type { StepIdentification } from './identify-step.js';
import type { SpeedModel } from './aggregate.js';
import { twoPointAgreesWithFit } from './two-point-agreement.js';
import type { FopdtRecord, RefusedTestRecord, SecondOrderRecord, SpeedRecord, StepFopdtRecord, TestRecord } from './models-schema.js';

/** Records of the models file built from identification results (plain copies; no computation). */

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

function stepFopdtRecord(fit: FopdtFit): StepFopdtRecord {
  const { parameters, uncertainty, quality } = fit.fit;
  return {
    gain: parameters[0],
    timeConstant_s: parameters[1],
    deadTime_s: parameters[2],
    standardErrors: { gain: uncertainty.standardErrors[0], timeConstant_s: uncertainty.standardErrors[1], deadTime_s: uncertainty.standardErrors[2] },
    ci95: {
      gain: [uncertainty.lower95[0], uncertainty.upper95[0]],
      timeConstant_s: [uncertainty.lower95[1], uncertainty.upper95[1]],
      deadTime_s: [uncertainty.lower95[2], uncertainty.upper95[2]],
    },
    bias_radps: fit.fit.bias,
    rmse: quality.rmse,
    nrmse: quality.nrmse,
    r2: quality.r2,
    bic: quality.bic,
    stopReason: fit.fit.stopReason,
    iterations: fit.fit.iterations,
    residualLag1Autocorrelation: quality.whiteness.lag1Autocorrelation,
    ljungBoxQ: quality.whiteness.ljungBoxQ,
    residualsWhite: quality.whiteness.white,
    twoPoint:
      fit.twoPoint === null
        ? null
        : {
            gain: fit.twoPoint.gain,
            timeConstant_s: fit.twoPoint.timeConstant_s,
            deadTime_s: fit.twoPoint.deadTime_s,
            agreesWithFit: twoPointAgreesWithFit(fit.twoPoint, { gain: parameters[0], timeConstant_s: parameters[1], deadTime_s: parameters[2] }),
          },
  };
}

function secondOrderRecord(fit: SecondOrderFit | null): SecondOrderRecord | null {
  if (fit === null) return null;
  const record: SecondOrderRecord = {
    gain: fit.model.gain,
    naturalFrequency_radps: fit.model.naturalFrequency_radps,
    dampingRatio: fit.model.dampingRatio,
    zeroTimeConstant_s: fit.model.zeroTimeConstant_s,
    deadTime_s: fit.model.deadTime_s,
    r2: fit.fit.quality.r2,
    bic: fit.fit.quality.bic,
    stopReason: fit.fit.stopReason,
  };
  return Object.values(record).every((v) => typeof v !== 'number' || Number.isFinite(v)) ? record : null;
}

/** Which step a record is about: file, index, onset, speed, amplitude and direction. */
function stepIdentity(step: StepIdentification): Pick<TestRecord, 'file' | 'stepIndex' | 'onset_s' | 'speed_mps' | 'amplitude_rad' | 'direction'> {
  const { file, stepIndex, onset_s, speed_mps, amplitude_rad, direction } = step;
  return { file, stepIndex, onset_s, speed_mps, amplitude_rad, direction };
}

/** A used step's record: FOPDT with intervals and quality, second-order fits, the BIC choice. Units as in the schema. */
export function testRecord(step: StepIdentification): TestRecord {
  return {
    ...stepIdentity(step),
    yawNoise_radps: step.yawNoise_radps,
    fopdt: stepFopdtRecord(step.fopdt),
    secondOrder: secondOrderRecord(step.secondOrder),
    secondOrderZero: secondOrderRecord(step.secondOrderZero),
    chosenModel: step.chosen,
  };
}

/** A refused step's record: where, why, and the FOPDT values found (null where not finite). */
export function refusedTestRecord(step: StepIdentification): RefusedTestRecord {
  const m = step.fopdt.model;
  return {
    ...stepIdentity(step),
    reasonCode: step.refusal?.reasonCode ?? 'unknown',
    reason: step.refusal?.reason ?? '',
    fopdt: {
      gain: finiteOrNull(m.gain),
      timeConstant_s: finiteOrNull(m.timeConstant_s),
      deadTime_s: finiteOrNull(m.deadTime_s),
      r2: finiteOrNull(step.fopdt.fit.quality.r2),
    },
  };
}

/** Order of step keys in a models file: by file name (UTF-16 code units, the same in every locale), then step index. */
export function compareStepKeys(p: { readonly file: string; readonly stepIndex: number }, q: { readonly file: string; readonly stepIndex: number }): number {
  return p.file < q.file ? -1 : p.file > q.file ? 1 : p.stepIndex - q.stepIndex;
}

/** A speed's record: inverse-variance FOPDT with standard errors and 95 % intervals, the steps combined (sorted by `compareStepKeys`). */
export function speedRecord(speed: SpeedModel): SpeedRecord {
  const fopdt: FopdtRecord = {
    gain: speed.gain.value,
    timeConstant_s: speed.timeConstant_s.value,
    deadTime_s: speed.deadTime_s.value,
    standardErrors: { gain: speed.gain.standardError, timeConstant_s: speed.timeConstant_s.standardError, deadTime_s: speed.deadTime_s.standardError },
    ci95: { gain: speed.gain.ci95, timeConstant_s: speed.timeConstant_s.ci95, deadTime_s: speed.deadTime_s.ci95 },
  };
  return {
    speed_mps: speed.speed_mps,
    stepCount: speed.stepCount,
    steps: [...speed.steps].sort(compareStepKeys),
    fopdt,
    asymmetry_pct: speed.asymmetry_pct,
    repeatSpread_pct: speed.repeatSpread_pct,
  };
}
