/** The schedule stage: plan, interpolation, dense check, refinement, schedule file. Re-exports only. */
export * from './types.js';
export * from './schedule-types.js';
export { makeGainLookup, gainSlopes, validateGainTable, LOOKUP_DEFAULTS, type GainSlopes } from './interpolate.js';
export { monotoneCubicSlopes, hermiteValue } from './monotone-cubic.js';
export { checkGrid } from './grid.js';
export { denseCheck, judgeMargins, worstMargins, THRESHOLD_DEFAULTS, type DenseCheckInput } from './dense-check.js';
export {
  refineBreakpoints,
  REFINE_DEFAULTS,
  type RefineInput,
  type RefineResult,
  type BreakpointInsertion,
  type UnfixableFailure,
  type RefineStop,
} from './refine.js';
export {
  PLAN_DEFAULTS,
  resolvePlan,
  planBreakpoints,
  type AcceptanceAtSpeed,
  type Plan,
  type PartialPlan,
  type LoopKind,
  type ReferencePoint,
  type SpeedTable,
  type SpeedVarying,
  type SpeedExpression,
  type PlanRuleParameters,
  type BreakpointPlan,
  type ResolveContext,
} from './plan.js';
export { readPlan, readPlanFile, planFromJson } from './plan-file.js';
export { PLAN_SCHEMA } from './plan-schema.js';
export { acceptanceLimits, numericAcceptanceLimits, limitSampleSpeeds, ACCEPTANCE_RANGES, type AcceptanceLimits } from './acceptance-limits.js';
export { makeRuleParameterLookup, valueAtSpeed, SPEED_VARYING_PARAMETERS, type RuleParameterLookup, type SpeedVaryingParameter } from './rule-parameters.js';
export { SCHEDULE_SCHEMA } from './schedule-schema.js';
export { canonicalJson } from './canonical-json.js';
export { computeScheduleChecksum, verifyScheduleChecksum, checksumContent, CANONICAL_FORM_TEXT, type ChecksumVerdict } from './checksum.js';
export { assembleSchedule, parseSchedule, parseScheduleUnverified, readSchedule, writeSchedule, type ScheduleInput } from './schedule-file.js';
export { serialiseSchedule } from './schedule-json.js';
export { gainUnits } from './schedule-text.js';
export { scheduleTable, scheduleLookup, scheduleLookupSettings } from './schedule-lookup.js';
export { scheduleGains, type ScheduleGainsInput } from './schedule-gains.js';
