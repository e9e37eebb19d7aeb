/** The compare stage: what moved between two schedules after a vehicle change. Re-exports only. */
export * from './types.js';
export { COMPARE_DEFAULTS, resolveThresholds } from './defaults.js';
export { compareSchedules } from './compare-schedules.js';
export { withVariations } from './variations.js';
export { gainChange, marginChange, marginLoss, type MarginSense } from './changes.js';
export { matchSpeeds, marginsAtSpeed, type ComparedPoint, type SpeedMatch, type MarginsAtSpeed, type MarginName } from './resample.js';
export { modelDrift, MODEL_PARAMETERS, OPTIONAL_MODEL_PARAMETERS } from './model-drift.js';
export { settingChanges } from './settings.js';
export { comparisonText } from './comparison-text.js';
export { comparisonMarkdown } from './comparison-markdown.js';
