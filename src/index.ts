/**
 * speedband's supported library API, by pipeline stage: what `import … from 'speedband'` gives, documented in
 * docs/api.md (generated from this file: `npm run api-reference`). Everything else is internal: reachable by its
 * module path as `speedband/internal/<stage>/<module>.js` (the compiled `dist/` tree), without a promise that it
 * stays. This file only re-exports.
 */

// Errors, files, the command line (src/core/, src/cli/)
export { SpeedbandError, isSpeedbandError, describeError, type ErrorLocation } from './core/errors.js';
export { ERROR_CODES, type ErrorCode } from './core/error-codes.js';
export { writeFileAtomic, type WriteOutcome, type WriteOptions } from './core/files.js';
export { SAFETY_CAUTIONS } from './core/safety.js';
export { VERSION } from './version.js';
export { runCli } from './cli/main.js';

// Step-test logs (src/log/)
export type { SteerLog, StepTest, StepMetrics, RejectedStep } from './log/types.js';
export { readSteerLog, parseSteerLog, READ_DEFAULTS, type ReadLogOptions } from './log/read.js';
export { loadLogProfile, parseColumnOptions, type LogProfile } from './log/profile.js';
export type { ColumnMap } from './log/column-map.js';
export { findStepTests, SEGMENT_DEFAULTS, type SegmentOptions, type StepSearch } from './log/segment.js';
export { inspectLog, type LogInspection } from './log/inspect.js';

// Vehicles and the single-track model (src/vehicle/)
export type { Vehicle, SingleTrackParameters } from './vehicle/types.js';
export { loadVehicle, validateVehicle } from './vehicle/load.js';
export {
  singleTrackParametersFromVehicle,
  singleTrackTransferFunctions,
  steadyStateYawGain_perS,
  understeerGradient_radPerMps2,
  characteristicSpeed_mps,
  criticalSpeed_mps,
} from './vehicle/single-track.js';
export { simulateSingleTrack, type SingleTrackSimulationInput, type SingleTrackSimulation } from './vehicle/simulate.js';
export { generateTestLog, writeTestLogs, TEST_LOG_DEFAULTS, type GeneratedTestLog, type TestLogOptions, type TestLogsInput } from './vehicle/test-logs.js';

// Identification (src/identify/)
export type { FopdtModel, LumpedModel } from './identify/types.js';
export { identifyFromLogs, type IdentifyFromLogsInput } from './identify/identify-from-logs.js';
export { IDENTIFY_DEFAULTS, type IdentifyOptions } from './identify/defaults.js';
export { readModels, writeModels, parseModels } from './identify/models-file.js';
export type { ModelsFile, SpeedRecord, SingleTrackRecord } from './identify/models-schema.js';

// Linear systems and controllers (src/lti/, src/controller/)
export type { TransferFunction, Complex } from './lti/types.js';
export { transferFunction, evaluateTransferFunction } from './lti/transfer-function.js';
export { frequencyResponse } from './lti/frequency-response.js';
export { stepResponse } from './lti/time-response.js';
export type { PidGains, Discretisation, ControllerSettings } from './controller/types.js';
export { CONTROLLER_DEFAULTS, resolveControllerSettings, describeControllerSettings } from './controller/defaults.js';
export { pidTransferFunction } from './controller/pid.js';
export { parallelToIdeal, idealToParallel, parallelToSeries, seriesToParallel } from './controller/pid-forms.js';
export {
  firmwareStep,
  initialFirmwareState,
  type AntiWindup,
  type FirmwareGains,
  type FirmwareSettings,
  type FirmwareState,
  type FirmwareInput,
  type FirmwareOutput,
} from './controller/firmware-step.js';

// Loops, margins and verdicts (src/loops/, src/verify/)
export type { LoopKind, ReferencePoint, LoopSpecification, LoopPlant } from './loops/types.js';
export { loopPlantFromLumped, loopPlantFromSingleTrack } from './loops/build.js';
export { analyseLoop, type LoopDescription } from './verify/analyse-loop.js';
export type { LoopMargins } from './verify/types.js';

// Tuning rules (src/tuning/)
export type { RuleName, RuleParameters, RuleResult, DesignModel, TuningRule } from './tuning/types.js';
export { TUNING_RULES, RULE_NAMES, findRule, applyRule, applicableRules } from './tuning/registry.js';
export { TUNING_DEFAULTS } from './tuning/defaults.js';
export { tuneOperatingPoint, type OperatingPointModel, type OperatingPointRequest, type TunedOperatingPoint } from './tuning/operating-point.js';

// Time-domain figures at a breakpoint (src/performance/)
export { breakpointPerformance, type BreakpointPerformance, type BreakpointPerformanceInput } from './performance/breakpoint-performance.js';
export { simulateClosedLoop, type LoopSimulationInput, type LoopSimulation } from './performance/closed-loop-simulation.js';
export type { TimeDomainFigures, TimeDomainLimits } from './performance/types.js';

// Scenarios: the schedule driven through manoeuvres as firmware runs it (src/performance/, speedband simulate)
export { SCENARIO_NAMES, type ScenarioName } from './performance/scenario-catalogue.js';
export { scenarioMetrics, type ScenarioMetrics } from './performance/scenario-metrics.js';
export { detectLimitCycle, type LimitCycle } from './performance/limit-cycle.js';
export type { ScenarioLimits } from './performance/scenario-limits.js';
export { tracesCsv } from './performance/traces-csv.js';

// Plans and schedule files (src/schedule/)
export { PLAN_DEFAULTS, DEFAULT_RULES, resolvePlan, type Plan, type PartialPlan } from './schedule/plan.js';
export { readPlan, planFromJson } from './schedule/plan-file.js';
export { defaultPlanFile } from './schedule/default-plan.js';
export type { ScheduleFile } from './schedule/schedule-types.js';
export { readSchedule, parseSchedule, writeSchedule } from './schedule/schedule-file.js';
export { computeScheduleChecksum, verifyScheduleChecksum } from './schedule/checksum.js';
export { scheduleLookup, scheduleExtrasLookup } from './schedule/schedule-lookup.js';
export { denseCheck, judgeMargins } from './schedule/dense-check.js';
export type { AcceptanceThresholds, DenseCheckResult, CheckPoint, CheckFailure, WorstMargins } from './schedule/types.js';

// Exports for firmware and spreadsheets (src/export/)
export { exportC, C_HEADER_DEFAULTS, type CHeaderOptions, type CHeaderExport } from './export/c-header.js';
export { exportCsv } from './export/csv.js';
export { exportJson } from './export/json.js';
export { parseFixedPointRequest, type FixedPointRequest } from './export/fixed-point.js';

// After a vehicle change (src/compare/)
export { compareSchedules } from './compare/compare-schedules.js';
export { comparisonText } from './compare/comparison-text.js';
export { comparisonMarkdown } from './compare/comparison-markdown.js';
export type { ScheduleComparison, OldGainsOnNewVehicle } from './compare/types.js';

// The main job end to end (src/pipeline/)
export { buildSchedule, buildScheduleFromData, type BuildInput, type LoadedBuildInput, type BuildResult } from './pipeline/build-schedule.js';
export { recheckSchedule, recheckScheduleOnAllCores, type RecheckInput } from './pipeline/recheck-schedule.js';
export { reverifySchedule, type ReverifyResult } from './pipeline/reverify.js';
export { runDemo, DEMO_DEFAULTS, type DemoInput, type DemoResult } from './pipeline/demo.js';
export { simulateSchedule, judgeScheduleScenarios, type ScenarioRunAt } from './pipeline/simulate-schedule.js';
export { speedChangeCertificate } from './pipeline/speed-change-certificate.js';

// The worst case over a set of vehicles (src/robust/)
export type { VariationSet, RobustSearchSettings, RobustFigure, Combination, WorstFigure, RobustTimeDomain } from './schedule/variation-types.js';
export type { RobustMargins, RobustCheckResult } from './robust/types.js';
export { resolveVariationSet } from './robust/variation-set.js';
export { worstCaseOverSet } from './robust/worst-case.js';
export { robustCheck } from './robust/robust-check.js';
export { robustScheduleCheck, type RobustScheduleCheck } from './pipeline/robust-schedule-check.js';
export { VARIATION_DEFAULTS, type PlanVariations } from './schedule/plan-variations.js';

// The HTML report (src/report/)
export { gatherReportData, type ReportInput } from './report/report-data.js';
export { renderReportHtml, writeReport } from './report/write-report.js';
export type { ReportData } from './report/types.js';
