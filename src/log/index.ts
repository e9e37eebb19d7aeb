/** Stage 1, read: CSV step-test logs, step segmentation, transient metrics. Re-exports only. */
export * from './types.js';
export { CHANNELS, REQUIRED_CHANNELS, CHANNEL_DEFINITIONS, type ChannelName } from './columns.js';
export { BUILT_IN_UNITS, STEERING_WHEEL_PREFIX, builtInConversion, resolveColumnUnit, type UnitConversion, type UnitOrigin } from './column-units.js';
export { mergeColumnMaps, resolveColumns, resolveColumnUnits, type ColumnMap, type ColumnSource, type ResolvedColumn } from './column-map.js';
export { LOG_PROFILE_SCHEMA, loadLogProfile, parseLogProfile, parseColumnOptions, type LogProfile } from './profile.js';
export { READ_DEFAULTS, readSteerLog, parseSteerLog, type ReadLogOptions } from './read.js';
export { SEGMENT_DEFAULTS, findStepTests, type SegmentOptions, type StepSearch } from './segment.js';
export { METRICS_DEFAULTS, stepMetrics, stepLevels, firstCrossing, type StepWindow, type StepLevels } from './metrics.js';
export { inspectLog, INSPECT_DEFAULTS, type LogInspection, type StepSummary, type ChannelSummary } from './inspect.js';
export { formatInspection, formatInspectionSummary } from './inspection-text.js';
