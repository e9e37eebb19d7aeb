/**
 * The stability verdict of one loop: one decisive test, the other as its cross-check.
 * - Sampled loop (a discrete controller, every schedule): the exact closed-loop poles in z with a
 *   bound on their rounding error (sampled-verdict.ts) decide; the Nyquist count on the exact pulse
 *   frequency response (sampled-nyquist.ts) cross-checks.
 * - Continuous loop: the closed-loop poles with the delay as a Padé approximant (order chosen from
 *   ω·θ over the band where |L| ≥ 0.5) decide; the Nyquist count with the exact delay cross-checks.
 *   When the two disagree the pole test is repeated at a higher Padé order; a disagreement that
 *   remains means the loop lies within the Padé approximation's reach of the boundary: 'marginal',
 *   named. A delayed loop with |L(j∞)| ≥ 1 is neutral-type: unstable whatever the margins.
 */
import { closedLoopPoleVerdict, closedLoopPoleVerdictAtOrder } from './closed-loop-poles.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { nyquistCount } from './encirclement.js';
import type { LoopGrid } from './frequency-grid.js';
import { sampledNyquistCount } from './sampled-nyquist.js';
import type { SampledPlant } from './sampled-plant.js';
import { sampledVerdictOf } from './sampled-verdict.js';
import type { Sweep } from './sweep.js';
import type { AnalysisScope, DiscreteControllerFactor, LoopAnalysisDetails, LoopMargins } from './types.js';

export type DecisionDetails = Omit<LoopAnalysisDetails, 'gainCrossovers' | 'phaseCrossovers' | 'bandLow_radps' | 'bandHigh_radps' | 'delayMarginNote'>;

export interface Decision {
  readonly verdict: LoopMargins['verdict'];
  readonly details: DecisionDetails;
}

/** Highest grid frequency (rad/s) where |L| ≥ threshold, extended by one grid step; the low end if none. */
function bandWhereGainMatters(grid: LoopGrid, threshold: number): number {
  const { frequency_radps: w, magnitude } = grid;
  for (let i = w.length - 1; i >= 0; i--) if (magnitude[i] >= threshold) return w[Math.min(i + 1, w.length - 1)];
  return w[0];
}

type CountVerdict = LoopAnalysisDetails['encirclementVerdict'];

/** Whether the cross-check agrees: null when it could not count. */
const agreement = (decided: LoopMargins['verdict'], count: CountVerdict): boolean | null => (count === 'undetermined' ? null : count === decided);

/** Verdict of a continuous loop N/D·e^(−θs); see the module comment. */
export function continuousDecision(numerator: readonly number[], denominator: readonly number[], delay_s: number, sweep: Sweep): Decision {
  const highFrequencyLoopGain = numerator.length === denominator.length ? Math.abs(numerator[0] / denominator[0]) : 0;
  const neutralType = delay_s > 0 && highFrequencyLoopGain >= 1 - ANALYSIS_DEFAULTS.neutralTolerance;
  const lastConstant = denominator[denominator.length - 1];
  const count = nyquistCount({
    phaseCrossovers: sweep.phaseCrossovers,
    originPoles: sweep.originPoles,
    rightHalfPlanePoles: sweep.rightHalfPlanePoles,
    otherAxisPoles: sweep.otherAxisPoles,
    lowPhase_rad: sweep.grid.phase_rad[0],
    lowMagnitude: sweep.grid.magnitude[0],
    zeroFrequencyValue: sweep.originPoles === 0 && lastConstant !== 0 ? numerator[numerator.length - 1] / lastConstant : null,
    magnitudeTolerance: ANALYSIS_DEFAULTS.crossingMagnitudeTolerance,
  });
  const encirclementVerdict: CountVerdict =
    count.closedLoopRightHalfPlanePoles === null
      ? count.reason?.includes('marginal')
        ? 'marginal'
        : 'undetermined'
      : count.closedLoopRightHalfPlanePoles === 0
        ? 'stable'
        : 'unstable';
  let poles = closedLoopPoleVerdict({
    numerator,
    denominator,
    delay_s,
    bandFrequency_radps: bandWhereGainMatters(sweep.grid, ANALYSIS_DEFAULTS.padeBandMagnitude),
    relativeTolerance: ANALYSIS_DEFAULTS.poleRelativeTolerance,
  });
  const disagrees = (): boolean => encirclementVerdict !== 'undetermined' && encirclementVerdict !== poles.verdict;
  if (delay_s > 0 && disagrees() && poles.padeOrder < ANALYSIS_DEFAULTS.padeRetryOrder) {
    poles = closedLoopPoleVerdictAtOrder({
      numerator,
      denominator,
      delay_s,
      padeOrder: ANALYSIS_DEFAULTS.padeRetryOrder,
      relativeTolerance: ANALYSIS_DEFAULTS.poleRelativeTolerance,
    });
  }
  let verdict: LoopMargins['verdict'];
  let verdictNote: string | null = null;
  let decidedBy: LoopAnalysisDetails['decidedBy'] = 'closed-loop poles with a Padé delay';
  if (neutralType) {
    verdict = 'unstable';
    decidedBy = 'neutral-type loop';
    verdictNote = `|L(j∞)| = ${highFrequencyLoopGain.toPrecision(4)} ≥ 1 with a delay: a neutral-type loop, unstable whatever the margins`;
  } else if (delay_s > 0 && disagrees()) {
    verdict = 'marginal';
    verdictNote = `the closed-loop poles with a Padé delay of order ${poles.padeOrder} say ${poles.verdict} (rightmost real part ${poles.largestRealPart.toExponential(2)} 1/s) and the exact-delay Nyquist count says ${encirclementVerdict}: the loop lies within the Padé approximation's reach of the stability boundary`;
  } else {
    verdict = poles.verdict;
    if (verdict === 'marginal')
      verdictNote = `a closed-loop pole lies on the imaginary axis within rounding (rightmost real part ${poles.largestRealPart.toExponential(2)} 1/s)`;
  }
  return {
    verdict,
    details: {
      decidedBy,
      verdictNote,
      crossCheckAgrees: agreement(verdict, encirclementVerdict),
      closedLoopPoleVerdict: poles.verdict,
      padeOrder: poles.padeOrder,
      rightmostClosedLoopPoleRealPart_perS: Number.isFinite(poles.largestRealPart) ? poles.largestRealPart : null,
      encirclementVerdict,
      encirclementNote: count.reason,
      closedLoopRightHalfPlanePoles: count.closedLoopRightHalfPlanePoles,
      openLoopRightHalfPlanePoles: sweep.rightHalfPlanePoles,
      openLoopOriginPoles: sweep.originPoles,
      highFrequencyLoopGain,
      neutralType,
    },
  };
}

/**
 * Verdict of the sampled loop (plant N/D·e^(−θs), zero-order hold, C(z)): its exact closed-loop poles
 * decide, the Nyquist count on its pulse frequency response cross-checks. The pole and count fields of
 * the details then speak of the sampled loop (no Padé: order 0; right-half-plane poles read as poles
 * outside the unit circle; origin poles include the controller's integrator at z = 1). `scope` 'figures'
 * leaves the count out (the poles decide either way).
 */
export function sampledDecision(plant: SampledPlant, discrete: DiscreteControllerFactor, sweep: Sweep, scope: AnalysisScope = 'full'): Decision {
  const poles = sampledVerdictOf({ plant, controller: discrete, sampleTime_s: discrete.sampleTime_s, plantPoles: sweep });
  // Without the cross-check (analysis scope 'figures') the count is reported as not made.
  const count =
    scope === 'full'
      ? sampledNyquistCount(plant, discrete, sweep, { pulseNumerator: sweep.compiled.sampled?.pulse.numerator })
      : {
          verdict: 'undetermined' as const,
          reason: 'not counted (analysis scope "figures")',
          closedLoopOutsidePoles: null,
          openLoopOutsidePoles: sweep.rightHalfPlanePoles,
          openLoopUnitPoles: sweep.originPoles,
        };
  return {
    verdict: poles.verdict,
    details: {
      decidedBy: poles.method === 'eigenvalues' ? 'sampled-data closed-loop poles' : 'sampled-data argument principle',
      verdictNote: poles.note,
      crossCheckAgrees: poles.method === 'eigenvalues' ? agreement(poles.verdict, count.verdict) : null,
      closedLoopPoleVerdict: poles.verdict,
      padeOrder: 0,
      rightmostClosedLoopPoleRealPart_perS: null,
      encirclementVerdict: count.verdict,
      encirclementNote: count.reason,
      closedLoopRightHalfPlanePoles: count.closedLoopOutsidePoles,
      openLoopRightHalfPlanePoles: count.openLoopOutsidePoles,
      openLoopOriginPoles: count.openLoopUnitPoles,
      highFrequencyLoopGain: 0,
      neutralType: false,
      sampledDataVerdict: poles.verdict,
      sampledDataLargestPoleMagnitude: poles.largestPoleMagnitude,
      sampledDataDecidingPole: poles.decidingPole,
      sampledDataSlowestTimeConstant_s: poles.slowestTimeConstant_s,
      sampledDataHighFrequencyPoleMagnitude: poles.highFrequencyPoleMagnitude,
      sampledDataEncirclementVerdict: count.verdict,
      sampledDataEncirclementNote: count.reason,
      sampledDataClosedLoopOutsidePoles: count.closedLoopOutsidePoles,
    },
  };
}
