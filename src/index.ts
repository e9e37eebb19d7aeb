/**
 * speedband's public API. This file only re-exports; see DEVELOPERS.md for the map.
 */
export { SpeedbandError, isSpeedbandError, describeError, type ErrorLocation } from './core/errors.js';
export { parseJsonText, jsonPointer } from './core/json-text.js';
export { quoted, safeMessageText } from './core/quote.js';
export { writeFileAtomic, readTextFile, sha256Hex, type WriteOutcome } from './core/files.js';
export { checkOutputPaths, checkOutputFolder, type OutputPath, type InputPath } from './core/output-paths.js';
export { VERSION } from './version.js';
export { runCli } from './cli/main.js';
// Linear systems (src/lti/) and controllers (src/controller/)
export type { TransferFunction, Complex, FrequencyResponse, StateSpaceModel, TimeResponse } from './lti/types.js';
export { trimPolynomial, addPolynomials, multiplyPolynomials, scalePolynomial, differentiatePolynomial, evaluatePolynomial, polynomialDegree } from './lti/polynomial.js';
export { polynomialRoots } from './lti/roots.js';
export {
  transferFunction,
  seriesConnection,
  parallelConnection,
  unityFeedback,
  scaleTransferFunction,
  evaluateTransferFunction,
  transferFunctionPoles,
  transferFunctionZeros,
  dcGain,
  relativeDegree,
} from './lti/transfer-function.js';
export { frequencyResponse, logarithmicFrequencies, responseMagnitude } from './lti/frequency-response.js';
export { padeApproximant, replaceDelayWithPade, padeOrderFor, padePhaseError_rad, PADE_DEFAULTS } from './lti/pade.js';
export { controllableCanonicalForm } from './lti/state-space.js';
export { stepResponse, inputResponse, zeroOrderHoldDiscretisation, type HoldDiscretisation } from './lti/time-response.js';
export type { PidGains, PidForm, Discretisation, ControllerSettings, IdealPid, SeriesPid } from './controller/types.js';
export { parallelToIdeal, idealToParallel, seriesToIdeal, idealToSeries, parallelToSeries, seriesToParallel } from './controller/pid-forms.js';
export { pidTransferFunction, derivativeFilterTime_s } from './controller/pid.js';
export {
  discretePidCoefficients,
  discretePidFrequencyResponse,
  samplingDelay_s,
  DISCRETE_PID_EQUATION,
  type DiscretePidCoefficients,
  type ControllerWarning,
} from './controller/discrete.js';
export { discretePidStep, initialDiscretePidState, type DiscretePidState } from './controller/discrete-step.js';
export { CONTROLLER_DEFAULTS } from './controller/defaults.js';
// THE controller equation of a schedule (2-DOF PID, feed-forward, anti-windup, clamps), one sample at a time.
export {
  firmwareStep,
  initialFirmwareState,
  trackingTime_s,
  type AntiWindup,
  type FirmwareGains,
  type FirmwareSettings,
  type FirmwareState,
  type FirmwareInput,
  type FirmwareOutput,
} from './controller/firmware-step.js';
// Time-domain figures of the exact sampled closed loop (src/performance/) and the curvature feed-forward.
export { simulateClosedLoop, type LoopSimulationInput, type LoopSimulation } from './performance/closed-loop-simulation.js';
export { simulateLimitedLoop, type LimitedLoopInput, type LimitedLoopSimulation } from './performance/limited-loop-simulation.js';
export { breakpointPerformance, judgeTimeDomain, type BreakpointPerformance, type BreakpointPerformanceInput, type SetpointWeights } from './performance/breakpoint-performance.js';
export { performanceLoopAt, type PerformanceLoop } from './performance/loop-at-speed.js';
export { SCENARIO_DEFAULTS } from './performance/defaults.js';
export type { TimeDomainFigures, TimeDomainLimits } from './performance/types.js';
// Scenarios: the schedule driven through manoeuvres as firmware runs it (speedband simulate), their limits and the speed-change certificate.
export { simulateScenario, type ScenarioController, type ScenarioSetup, type ScenarioTraces, type ScenarioVehicle } from './performance/scenario-simulation.js';
export { runScenario, type ScenarioRun } from './performance/scenario-run.js';
export { prepareScenario, SCENARIO_NAMES, type ScenarioName, type PreparedScenario, type ScenarioSizes } from './performance/scenario-catalogue.js';
export { scenarioMetrics, type ScenarioMetrics } from './performance/scenario-metrics.js';
export { detectLimitCycle, type LimitCycle } from './performance/limit-cycle.js';
export { judgeScenarioRun, type ScenarioFailure, type ScenarioLimits } from './performance/scenario-limits.js';
export { tracesCsv } from './performance/traces-csv.js';
export { simulateSchedule, judgeScheduleScenarios, scheduleScenarioController, type ScenarioRunAt } from './build/simulate-schedule.js';
export { speedChangeCertificate } from './build/speed-change-certificate.js';
export { feedForwardFromSingleTrack, feedForwardFromLumped, rampLag_s, type FeedForward } from './loops/feed-forward.js';
// Vehicles, the single-track model, the exact simulator and synthetic test logs (src/vehicle/)
export type { Vehicle, SingleTrackParameters } from './vehicle/types.js';
export { loadVehicle, validateVehicle, resolveVehiclePath, VEHICLE_FILE_NAME } from './vehicle/load.js';
export { VEHICLE_SCHEMA, VEHICLE_RANGES } from './vehicle/schema.js';
export {
  singleTrackStateSpace,
  singleTrackTransferFunctions,
  actuatorTransferFunction,
  understeerGradient_radPerMps2,
  steadyStateYawGain_perS,
  characteristicSpeed_mps,
  criticalSpeed_mps,
  singleTrackParametersFromVehicle,
  type SingleTrackStateSpace,
  type SingleTrackTransferFunctions,
} from './vehicle/single-track.js';
export { simulateSingleTrack, type SingleTrackSimulationInput, type SingleTrackSimulation } from './vehicle/simulate.js';
export { stepAmplitudes, planSteps, sampleCommand, planDuration_s, STEP_PLAN_DEFAULTS, type PlannedStep, type StepAmplitudes } from './vehicle/step-plan.js';
export { generateTestLog, writeTestLogs, testLogsReadme, testLogFileName, TEST_LOG_DEFAULTS, TEST_LOG_COLUMNS, type GeneratedTestLog, type TestLogOptions } from './vehicle/test-logs.js';
export { DEMO_FLEET, regenerateDemoFleet, regenerateDemoVehicle, type DemoVehicle } from './vehicle/demo-fleet.js';
export { matrixExponential } from './lti/matrix-exponential.js';
// Identification: per-step fits, per-speed models, actuator, joint single-track fit, models file (src/identify/)
export * from './identify/index.js';
// Log reading, step segmentation, transient metrics, inspection (src/log/)
export type { SteerLog, LogSegment, LogSplit, LogChannelSource, StepTest, StepMetrics, RejectedStep } from './log/types.js';
export { readSteerLog, parseSteerLog, READ_DEFAULTS, type ReadLogOptions } from './log/read.js';
export { loadLogProfile, parseLogProfile, parseColumnOptions, LOG_PROFILE_SCHEMA, type LogProfile } from './log/profile.js';
export { mergeColumnMaps, resolveColumnUnits, type ColumnMap, type ColumnSource } from './log/column-map.js';
export { BUILT_IN_UNITS, resolveColumnUnit, type UnitConversion } from './log/column-units.js';
export { CHANNELS, type ChannelName } from './log/columns.js';
export { findStepTests, SEGMENT_DEFAULTS, type SegmentOptions, type StepSearch } from './log/segment.js';
export { stepMetrics, stepLevels, METRICS_DEFAULTS, type StepWindow, type StepLevels } from './log/metrics.js';
export { inspectLog, type LogInspection, type StepSummary, type ChannelSummary } from './log/inspect.js';
export { formatInspection, formatInspectionSummary } from './log/inspection-text.js';
// The schedule: plan, interpolation, dense check, refinement, schedule file (src/schedule/); exports (src/export/)
export {
  makeGainLookup,
  gainSlopes,
  monotoneCubicSlopes,
  checkGrid,
  denseCheck,
  judgeMargins,
  refineBreakpoints,
  scheduleGains,
  THRESHOLD_DEFAULTS,
  PLAN_DEFAULTS,
  PLAN_SCHEMA,
  resolvePlan,
  readPlan,
  planFromJson,
  planBreakpoints,
  planThresholds,
  makeRuleParameterLookup,
  valueAtSpeed,
  SPEED_VARYING_PARAMETERS,
  SCHEDULE_SCHEMA,
  canonicalJson,
  computeScheduleChecksum,
  verifyScheduleChecksum,
  assembleSchedule,
  parseSchedule,
  parseScheduleUnverified,
  readSchedule,
  writeSchedule,
  serialiseSchedule,
  scheduleTable,
  scheduleLookup,
  gainUnits,
  type GainTable,
  type LookupSettings,
  type InterpolationMethod,
  type AcceptanceThresholds,
  type AnalyseLoop,
  type GainsAtSpeed,
  type DenseCheckResult,
  type CheckPoint,
  type CheckFailure,
  type WorstMargins,
  type RefineInput,
  type RefineResult,
  type BreakpointInsertion,
  type Plan,
  type PartialPlan,
  type RuleParameterLookup,
  type ScheduleFile,
  type ScheduleInput,
} from './schedule/index.js';
export {
  exportC,
  exportCsv,
  exportJson,
  parseQFormat,
  quantiseTable,
  recheckQuantised,
  makeQuantisedRecheck,
  allowFailingMacro,
  commentSafe,
  LOOKUP_STATUS,
  type FixedPointFormat,
  type QuantisedTable,
  type QuantisedRecheck,
  type HeaderCheck,
  type FallbackGains,
} from './export/index.js';
// Loop analysis: margins, sensitivity peaks, stability verdicts (src/verify/)
export {
  analyseLoop,
  analyseOpenLoop,
  openLoopOf,
  parallelGainsOf,
  phaseMarginFromPhase,
  sampledLoopVerdict,
  sampledPlant,
  sampledNyquistCount,
  pulseTransferFunction,
  sampledLoopEvaluator,
  ANALYSIS_DEFAULTS,
  LOOP_DEFAULTS,
  type SampledLoop,
  type SampledVerdict,
  type SampledPlant,
  type SampledNyquistResult,
  type LoopDescription,
  type LoopMargins,
  type LoopAnalysisDetails,
  type OpenLoop,
  type DiscreteControllerFactor,
} from './verify/index.js';
// Loop plants (src/loops/) and tuning rules (src/tuning/)
export {
  LOOPS,
  LOOP_KINDS,
  findLoop,
  loopPlantFromLumped,
  loopPlantFromSingleTrack,
  previewFromCg_m,
  lumpedYawRateTransferFunction,
  type LoopKind,
  type ReferencePoint,
  type LoopSpecification,
  type LoopPlant,
  type LoopContext,
  type LoopDefinition,
} from './loops/index.js';
export {
  TUNING_DEFAULTS,
  TUNING_RULES,
  RULE_NAMES,
  findRule,
  applicableRules,
  applyRule,
  plantClassOf,
  reduceByHalfRule,
  ultimatePoint,
  reactionCurve,
  zieglerNicholsStep,
  zieglerNicholsUltimate,
  imcPid,
  simc,
  dampingTarget,
  amigo,
  migo,
  fopdtByTwoPoints,
  designModelFromLumped,
  designModelFromSingleTrack,
  tuneOperatingPoint,
  loopMargins,
  proportionalGainRange,
  describeTunedOperatingPoint,
  type PlantClass,
  type ControllerType,
  type DesignModel,
  type RuleForm,
  type RuleResult,
  type RuleName,
  type RuleParameters,
  type RuleContext,
  type TuningRule,
  type DesignModelDerivation,
  type OperatingPointModel,
  type OperatingPointRequest,
  type TunedOperatingPoint,
  type ProportionalGainRange,
} from './tuning/index.js';

// After a vehicle change: compare two schedules (gains, margins, model drift, flags).
export * from './compare/index.js';
// The main job: build, re-check, demo (src/build/)
export { buildSchedule, planLoopAndController, type BuildInput, type BuildResult } from './build/build-schedule.js';
export {
  checkModelFromModels,
  checkModelFromSummary,
  parseCheckModelSummary,
  lumpedAt,
  type CheckModel,
  type CheckModelKind,
  type CheckModelSummary,
  type LumpedAtSpeed,
} from './build/check-model.js';
export { makeLoopAnalysis } from './build/loop-analysis.js';
export { operatingPointModelFromModels, type ModelAtSpeed } from './build/operating-point-from-models.js';
export { recheckSchedule, recordedCheckModel, scheduleLoopAndController, type RecheckInput as ScheduleRecheckInput } from './build/recheck-schedule.js';
export { recheckWithRecordedModel } from './build/quantised-recheck.js';
export { runDemo, bundledVehicles, BUNDLED_VEHICLES, DEMO_DEFAULTS, type DemoInput, type DemoResult } from './build/demo.js';
export { recordedLoopAnalysis, checkExportedTable, findFallbackGains } from './build/export-check.js';
export { reverifySchedule, type ReverifyResult } from './build/reverify.js';
export { DELAY_BOUNDS, requireBoundedDelay } from './build/delay-bound.js';
