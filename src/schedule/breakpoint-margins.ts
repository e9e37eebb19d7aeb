/**
 * The margins a schedule records at a breakpoint, from the loop analysis: non-finite figures (no crossover, an
 * unbounded margin) as null, as JSON holds them. Apart from schedule-file.ts, so that what only records margins (the
 * robust search on the check worker threads among them) does not load the file validators.
 */
import type { LoopMargins } from '../verify/types.js';
import type { BreakpointMargins } from './schedule-types.js';

const finiteOrNull = (value: number | null): number | null => (value !== null && Number.isFinite(value) ? value : null);

/** The margins a schedule records at a breakpoint (non-finite figures as null). */
export function breakpointMargins(margins: LoopMargins): BreakpointMargins {
  return {
    stable: margins.stable,
    verdict: margins.verdict,
    lowerGainMargin_dB: finiteOrNull(margins.lowerGainMargin_dB),
    upperGainMargin_dB: finiteOrNull(margins.upperGainMargin_dB),
    phaseMargin_deg: finiteOrNull(margins.phaseMargin_deg),
    delayMargin_s: finiteOrNull(margins.delayMargin_s),
    sensitivityPeak: finiteOrNull(margins.sensitivityPeak),
    complementarySensitivityPeak: finiteOrNull(margins.complementarySensitivityPeak),
  };
}
