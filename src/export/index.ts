/** The export stage: C99 header, CSV, JSON, fixed-point gains, the integer step and its error bound, the quantised re-check. Re-exports only. */
export {
  exportC,
  cDouble,
  allowFailingMacro,
  C_HEADER_DEFAULTS,
  type CHeaderOptions,
  type CHeaderExport,
  type HeaderCheck,
  type FallbackGains,
} from './c-header.js';
export { commentSafe, cComment } from './c-comment.js';
export { LOOKUP_STATUS } from './c-lookup.js';
export { exportCsv } from './csv.js';
export { exportJson } from './json.js';
export {
  parseQFormat,
  parseFixedPointRequest,
  quantiseTable,
  formatName,
  type FixedPointFormat,
  type FixedPointRequest,
  type QuantisedTable,
  type GainQuantisationError,
} from './fixed-point.js';
export { integerLookup, makeIntegerGainLookup, speedToInteger, SPEED_FRACTIONAL_BITS, type IntegerTable } from './integer-lookup.js';
export { integerStepPlan, SIGNAL_FRACTIONAL_BITS, ACCUMULATOR_FRACTIONAL_BITS, type IntegerStepPlan } from './integer-step-plan.js';
export { fixedPointCommandBound, type BoundRun, type CommandBound } from './fixed-point-bound.js';
export { lookupErrorBound } from './lookup-error-bound.js';
export { recheckQuantised, makeQuantisedRecheck, type QuantisedRecheck, type RecheckInput } from './recheck.js';
export { toAscii } from './ascii.js';
