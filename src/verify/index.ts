export { analyseOpenLoop, phaseMarginFromPhase } from './analyse-open-loop.js';
export { ANALYSIS_DEFAULTS } from './defaults.js';
export { pulseTransferFunction, sampledLoopVerdict, type SampledLoop, type SampledVerdict } from './sampled-verdict.js';
export { sampledPlant, splitDelay, type SampledPlant } from './sampled-plant.js';
export { sampledLoopEvaluator, sampledNyquistCount, type SampledNyquistResult } from './sampled-nyquist.js';
export { analyseLoop, openLoopOf, parallelGainsOf, LOOP_DEFAULTS, type LoopDescription } from './analyse-loop.js';
export type { LoopMargins, LoopAnalysisDetails, OpenLoop, DiscreteControllerFactor } from './types.js';
