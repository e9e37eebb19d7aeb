/** Identification (stage 2): re-exports only. */
export type { FopdtModel, SecondOrderModel, LumpedModel } from './types.js';
export { identifyFromLogs, expandLogPaths, canonicalLogOrder, type IdentifyFromLogsInput } from './identify-from-logs.js';
export { IDENTIFY_DEFAULTS, type IdentifyOptions } from './defaults.js';
export { identifyStep, type StepIdentification, type ModelStructure } from './identify-step.js';
export { fitFopdt, FOPDT_FIT_DEFAULTS, type FopdtFit, type FopdtFitOptions } from './fit-fopdt.js';
export { fitSecondOrder, type SecondOrderFit } from './fit-second-order.js';
export { fitStepModel, type BiasMode, type StepModelFit, type StepModelDefinition } from './fit-step-model.js';
export {
  fitLeastSquares,
  sumOfSquares,
  LEAST_SQUARES_DEFAULTS,
  type LeastSquaresProblem,
  type LeastSquaresOptions,
  type LeastSquaresResult,
  type StopReason,
} from './least-squares.js';
export { simulateFopdt, firstOrderStates, type CommandHold } from './simulate-fopdt.js';
export { simulateSecondOrder } from './simulate-second-order.js';
export { simulateThirdOrderHeld } from './simulate-third-order.js';
export { twoPointEstimate, type TwoPointEstimate } from './two-point.js';
export { twoPointAgreesWithFit, tallyTwoPointAgreement, TWO_POINT_AGREEMENT, type TwoPointTally } from './two-point-agreement.js';
export { compareStepKeys } from './models-records.js';
export { yawSignals, actuatorSignals, type StepSignals } from './step-signals.js';
export { fitQuality, type FitQuality } from './fit-quality.js';
export { ljungBox, studentT975, chiSquare95, autocorrelation, effectiveSampleSize, type WhitenessTest } from './statistics.js';
export { numericalJacobian, parameterUncertainty, type ParameterUncertainty } from './uncertainty.js';
export { checkYawFit, type FitRefusal } from './quality-gate.js';
export { aggregateSpeed, groupBySpeed, inverseVarianceMean, type SpeedModel, type CombinedValue } from './aggregate.js';
export { identifyActuator, type ActuatorIdentification } from './actuator.js';
export { fitSingleTrack, type SingleTrackFit, type SpeedComparison } from './joint-single-track.js';
export { simulateYawThroughActuator } from './simulate-single-track-yaw.js';
export { readModels, writeModels, parseModels, modelsToJson } from './models-file.js';
export {
  MODELS_SCHEMA,
  MODELS_FORMAT,
  MODELS_FORMAT_VERSION,
  type ModelsFile,
  type TestRecord,
  type RefusedTestRecord,
  type SpeedRecord,
  type FopdtRecord,
  type StepFopdtRecord,
  type SecondOrderRecord,
  type ActuatorRecord,
  type SingleTrackRecord,
  type HashedFile,
} from './models-schema.js';
