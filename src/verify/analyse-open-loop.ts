/**
 * Stability and robustness of one loop L(s) (DOMAIN.md §5 and §5b): every gain and
 * phase crossover, phase margin, both gain margins, delay margin, sensitivity peaks,
 * and a verdict from two independent tests that must agree.
 */
import { ratioToDecibels, radiansToDegrees } from '../core/units.js';
import { closedLoopPoleVerdict } from './closed-loop-poles.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { nyquistCount, type EncirclementResult } from './encirclement.js';
import type { LoopGrid } from './frequency-grid.js';
import { evaluateLoopResponse, newLoopPoint } from './loop-response.js';
import { sampledNyquistCount } from './sampled-nyquist.js';
import { sampledPlant, type SampledPlant } from './sampled-plant.js';
import { sampledVerdictOf } from './sampled-verdict.js';
import { sensitivityPeaks } from './sensitivity.js';
import { cancelCommonIntegrators, sweepLoop } from './sweep.js';
import type { DiscreteControllerFactor, LoopAnalysisDetails, LoopMargins, OpenLoop } from './types.js';
import { validateOpenLoop } from './validate-loop.js';

export { ANALYSIS_DEFAULTS };

/** Phase margin from the continuous phase at a gain crossover: 180° + ∠L wrapped into (−180°, 180°], rad. */
export function phaseMarginFromPhase(phase_rad: number): number {
  const x = phase_rad + Math.PI;
  return x - 2 * Math.PI * Math.ceil((x - Math.PI) / (2 * Math.PI));
}

const finite = (value: number): number => (Number.isFinite(value) ? value : Number.MAX_VALUE);

/** Highest grid frequency (rad/s) where |L| ≥ threshold, extended by one grid step; the low end if none. */
function bandWhereGainMatters(grid: LoopGrid, threshold: number): number {
  const { frequency_radps: w, magnitude } = grid;
  for (let i = w.length - 1; i >= 0; i--) if (magnitude[i] >= threshold) return w[Math.min(i + 1, w.length - 1)];
  return w[0];
}

/**
 * Analyse the open loop L(s) = N(s)/D(s)·e^(−θs) of a unity negative-feedback loop
 * (closed loop 1 + L = 0), optionally with a discrete controller C(z): the loop is then the
 * sampled loop L(e^(jωTs)) = C(e^(jωTs))·G_zoh(e^(jωTs)) for 0 < ω ≤ π/Ts, G_zoh the exact
 * zero-order-hold equivalent of the plant with its fractional delay (`sampledPlant`).
 * Frequencies rad/s, phases in degrees, gain margins in dB (20·log10 of the gain factor).
 *
 * - Gain crossovers (|L| = 1), refined by Brent's method: phase margin PMᵢ = 180° + ∠L
 *   in (−180°, 180°]; the smallest is reported. Delay margin (stable loops only) =
 *   min over crossovers of PMᵢ/ωᵢ, where a crossover with PMᵢ ≤ 0 needs
 *   (PMᵢ + 360°)/ωᵢ of extra delay to reach −1 (the added delay turns the point clockwise).
 *   Null for an unstable loop, and for a stable one without gain crossover (no delay destabilises it).
 * - Phase crossovers (∠L = −180°·(2k + 1)) and, for a loop without integrators whose
 *   L(0) is negative, ω = 0: each is a gain factor 1/|L| at which −1 lies on the curve
 *   and the encirclement count changes. Upper gain margin = the smallest factor > 1
 *   (raising the gain destabilises), lower = the largest factor < 1, reported as a
 *   negative dB figure 20·log10(1/|L|) (reducing the gain destabilises, as in a
 *   conditionally stable double integrator with PID). Null when there is none, and both
 *   null (with their frequencies) when the loop is not stable: a gain margin is the
 *   distance to instability and does not apply to a loop that is already unstable
 *   (reducing the gain may stabilise it); the phase margin is kept (negative is informative).
 * - Ms = max|1/(1 + L)| and Mt = max|L/(1 + L)|, refined by golden-section search.
 * - Verdict: closed-loop poles with a Padé approximant (order by `padeOrderFor` from
 *   ω·θ over the band where |L| ≥ 0.5) AND the Nyquist count Z = N + P with the exact
 *   delay (indented contour at s = 0). Poles within 1e−9 (relative) of the axis are on
 *   it, so a pole nudged from 0 to +1e−14 flips nothing. A delayed loop with
 *   |L(j∞)| ≥ 1 (e.g. an unfiltered derivative on a plant of relative degree one) is a
 *   neutral-type loop: unstable whatever the margins. If the two tests disagree the
 *   verdict is 'undetermined' and stable is false.
 * - With a discrete controller the verdict is decided on the exact sampled-data loop
 *   (`sampledPlant`: zero-order-hold equivalent of the plant with the fractional delay)
 *   by two tests: its closed-loop poles inside |z| < 1 (`sampledVerdictOf`, Schur–Cohn on
 *   the characteristic polynomial) AND the Nyquist count on its exact pulse frequency
 *   response (`sampledNyquistCount`): 'stable' only when both say stable, 'unstable' when
 *   both say unstable, else 'undetermined' (the continuous counterpart C(s) with a Ts/2
 *   delay, an approximation of sampling, is no longer used for the verdict: it called
 *   unstable sampled loops stable). The pole and count fields of `analysis` then speak of
   * the sampled loop (see `sampledDecision`). The margins, Ms and Mt are those of the exact
 *   pulse frequency response (every crossing and peak over 0 < ω ≤ π/Ts, refined as for a
 *   continuous loop; no Ts/2 approximation of the hold). There L(e^(jπ)) is real: when it is
 *   negative, ω = π/Ts is a crossing of the negative real axis too. The delay margin is
 *   quoted in continuous time (s); the firmware can only realise a delay in whole samples.
 * Throws `verify.invalidLoop` / `verify.improperLoop` on bad input.
 */
export function analyseOpenLoop(input: OpenLoop): LoopMargins {
  const loop = validateOpenLoop(input);
  const { numerator, denominator } = cancelCommonIntegrators(loop.numerator, loop.denominator);
  const discrete = loop.discreteController ?? null;
  const plant = discrete === null ? null : sampledPlant({ numerator, denominator, delay_s: loop.delay_s }, discrete.sampleTime_s);
  const margins = sweepLoop(numerator, denominator, loop.delay_s, discrete, true, plant);

  // Continuous loop: closed-loop poles with a Padé approximant AND the Nyquist count with the exact delay.
  // Sampled loop (discrete controller): its exact closed-loop poles (Schur–Cohn) AND the Nyquist count on its
  // exact pulse frequency response.
  const decision = discrete === null || plant === null ? continuousDecision(numerator, denominator, loop.delay_s, margins) : sampledDecision(plant, discrete, margins);
  const { verdict } = decision;
  const stable = verdict === 'stable';

  // Margins on the loop as the firmware runs it.
  const crossovers = margins.gainCrossovers.map((c) => ({ frequency_radps: c.frequency_radps, phaseMargin_rad: phaseMarginFromPhase(c.phase_rad) }));
  let phaseMargin: { value: number; frequency: number } | null = null;
  let delayMargin: { value: number; frequency: number } | null = null;
  for (const c of crossovers) {
    if (phaseMargin === null || c.phaseMargin_rad < phaseMargin.value) phaseMargin = { value: c.phaseMargin_rad, frequency: c.frequency_radps };
    const needed = (c.phaseMargin_rad > 0 ? c.phaseMargin_rad : c.phaseMargin_rad + 2 * Math.PI) / c.frequency_radps;
    if (delayMargin === null || needed < delayMargin.value) delayMargin = { value: needed, frequency: c.frequency_radps };
  }
  const critical = margins.phaseCrossovers.filter((c) => c.refined).map((c) => ({ frequency_radps: c.frequency_radps, magnitude: c.magnitude }));
  const mLast = margins.compiled.denominator[margins.compiled.denominator.length - 1];
  // ω = 0: L(0) real and negative (no integrator) is a critical gain too; a discrete controller contributes C(z = 1).
  const sum = (values: readonly number[]): number => values.reduce((total, value) => total + value, 0);
  // A controller pole at z = 1 (an integrator) leaves rounding residue in the sum of its denominator: no finite L(0) then.
  const atOne = (values: readonly number[]): boolean => Math.abs(sum(values)) <= ANALYSIS_DEFAULTS.sampledNyquist.circleTolerance * sum(values.map(Math.abs));
  const discreteDc = discrete === null ? 1 : atOne(discrete.denominator) ? Number.NaN : sum(discrete.numerator) / sum(discrete.denominator);
  if (margins.originPoles === 0 && mLast !== 0 && Number.isFinite(discreteDc)) {
    const zeroValue = (numerator[numerator.length - 1] / mLast) * discreteDc;
    if (zeroValue < 0) critical.push({ frequency_radps: 0, magnitude: -zeroValue });
  }
  // ω = π/Ts on a sampled loop: L(e^(jπ)) is real; negative, it is a crossing of the negative real axis at the band's end.
  if (plant !== null && discrete !== null) {
    const nyquist_radps = Math.PI / discrete.sampleTime_s;
    const point = newLoopPoint();
    evaluateLoopResponse(margins.compiled, nyquist_radps, point);
    const known = critical.some((c) => Math.abs(c.frequency_radps - nyquist_radps) <= ANALYSIS_DEFAULTS.frequencyRelativeTolerance * 1e3 * nyquist_radps);
    if (point.re < 0 && !known) critical.push({ frequency_radps: nyquist_radps, magnitude: point.magnitude });
  }
  let lower: { magnitude: number; frequency: number } | null = null;
  let upper: { magnitude: number; frequency: number } | null = null;
  // A gain margin is a distance to instability: it exists only for a stable loop.
  if (stable) for (const c of critical) {
    if (c.magnitude > 1 && (lower === null || c.magnitude < lower.magnitude)) lower = { magnitude: c.magnitude, frequency: c.frequency_radps };
    if (c.magnitude < 1 && c.magnitude > 0 && (upper === null || c.magnitude > upper.magnitude)) upper = { magnitude: c.magnitude, frequency: c.frequency_radps };
  }
  const peaks = sensitivityPeaks(margins.compiled, margins.grid, ANALYSIS_DEFAULTS.peakLogFrequencyTolerance);

  return {
    stable,
    verdict,
    phaseMargin_deg: phaseMargin === null ? null : radiansToDegrees(phaseMargin.value),
    phaseMarginFrequency_radps: phaseMargin === null ? null : phaseMargin.frequency,
    lowerGainMargin_dB: lower === null ? null : ratioToDecibels(1 / lower.magnitude),
    lowerGainMarginFrequency_radps: lower === null ? null : lower.frequency,
    upperGainMargin_dB: upper === null ? null : ratioToDecibels(1 / upper.magnitude),
    upperGainMarginFrequency_radps: upper === null ? null : upper.frequency,
    delayMargin_s: stable && delayMargin !== null ? delayMargin.value : null,
    delayMarginFrequency_radps: stable && delayMargin !== null ? delayMargin.frequency : null,
    // A grid point exactly on −1 would give an infinite peak: report the largest finite number instead (never Infinity).
    sensitivityPeak: finite(peaks.sensitivity.value),
    sensitivityPeakFrequency_radps: peaks.sensitivity.frequency_radps,
    complementarySensitivityPeak: finite(peaks.complementary.value),
    complementarySensitivityPeakFrequency_radps: peaks.complementary.frequency_radps,
    analysis: {
      ...decision.details,
      gainCrossovers: crossovers.map((c) => ({ frequency_radps: c.frequency_radps, phaseMargin_deg: radiansToDegrees(c.phaseMargin_rad) })),
      phaseCrossovers: critical.map((c) => ({ frequency_radps: c.frequency_radps, gainMargin_dB: ratioToDecibels(1 / c.magnitude) })),
      bandLow_radps: margins.band.low_radps,
      bandHigh_radps: margins.band.high_radps,
    },
  };
}

type Sweep = ReturnType<typeof sweepLoop>;
type DecisionDetails = Pick<
  LoopAnalysisDetails,
  | 'closedLoopPoleVerdict'
  | 'padeOrder'
  | 'encirclementVerdict'
  | 'encirclementNote'
  | 'closedLoopRightHalfPlanePoles'
  | 'openLoopRightHalfPlanePoles'
  | 'openLoopOriginPoles'
  | 'highFrequencyLoopGain'
  | 'neutralType'
  | 'sampledDataVerdict'
  | 'sampledDataLargestPoleMagnitude'
  | 'sampledDataEncirclementVerdict'
  | 'sampledDataEncirclementNote'
  | 'sampledDataClosedLoopOutsidePoles'
>;
interface Decision {
  readonly verdict: LoopMargins['verdict'];
  readonly details: DecisionDetails;
}

/** Verdict of a continuous loop N/D·e^(−θs): Padé closed-loop poles AND the Nyquist count with the exact delay; a neutral-type loop is unstable. */
function continuousDecision(numerator: readonly number[], denominator: readonly number[], delay_s: number, sweep: Sweep): Decision {
  const highFrequencyLoopGain = numerator.length === denominator.length ? Math.abs(numerator[0] / denominator[0]) : 0;
  const neutralType = delay_s > 0 && highFrequencyLoopGain >= 1 - ANALYSIS_DEFAULTS.neutralTolerance;
  const poles = closedLoopPoleVerdict(numerator, denominator, delay_s, bandWhereGainMatters(sweep.grid, ANALYSIS_DEFAULTS.padeBandMagnitude), ANALYSIS_DEFAULTS.poleRelativeTolerance);
  const lastConstant = denominator[denominator.length - 1];
  const count: EncirclementResult = nyquistCount({
    phaseCrossovers: sweep.phaseCrossovers,
    originPoles: sweep.originPoles,
    rightHalfPlanePoles: sweep.rightHalfPlanePoles,
    otherAxisPoles: sweep.otherAxisPoles,
    lowPhase_rad: sweep.grid.phase_rad[0],
    lowMagnitude: sweep.grid.magnitude[0],
    zeroFrequencyValue: sweep.originPoles === 0 && lastConstant !== 0 ? numerator[numerator.length - 1] / lastConstant : null,
    magnitudeTolerance: ANALYSIS_DEFAULTS.crossingMagnitudeTolerance,
  });
  const encirclementVerdict: LoopAnalysisDetails['encirclementVerdict'] =
    count.closedLoopRightHalfPlanePoles === null
      ? count.reason !== null && count.reason.includes('marginal')
        ? 'marginal'
        : 'undetermined'
      : count.closedLoopRightHalfPlanePoles === 0
        ? 'stable'
        : 'unstable';
  let verdict: LoopMargins['verdict'];
  if (neutralType) verdict = 'unstable';
  else if (poles.verdict === encirclementVerdict) verdict = poles.verdict === 'stable' ? 'stable' : 'unstable';
  else verdict = 'undetermined';
  return {
    verdict,
    details: {
      closedLoopPoleVerdict: poles.verdict,
      padeOrder: poles.padeOrder,
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
 * Verdict of the sampled loop (plant N/D·e^(−θs), zero-order hold, C(z)): its closed-loop poles
 * inside |z| < 1 (Schur–Cohn) AND the Nyquist count on its exact pulse frequency response;
 * 'stable' when both say stable, 'unstable' when both say unstable, else 'undetermined'. The
 * pole and count fields of the details then speak of the sampled loop (no Padé: order 0;
 * right-half-plane poles read as poles outside the unit circle; origin poles include the
 * controller's integrator at z = 1); a sampled loop is never neutral-type.
 */
function sampledDecision(plant: SampledPlant, discrete: DiscreteControllerFactor, sweep: Sweep): Decision {
  const poles = sampledVerdictOf(plant, discrete, ANALYSIS_DEFAULTS.sampledPoleRadiusTolerance, sweep.compiled.sampled?.pulse);
  const count = sampledNyquistCount(plant, discrete, sweep);
  const verdict = poles.verdict === 'stable' && count.verdict === 'stable' ? 'stable' : poles.verdict === 'unstable' && count.verdict === 'unstable' ? 'unstable' : 'undetermined';
  return {
    verdict,
    details: {
      closedLoopPoleVerdict: poles.verdict,
      padeOrder: 0,
      encirclementVerdict: count.verdict,
      encirclementNote: count.reason,
      closedLoopRightHalfPlanePoles: count.closedLoopOutsidePoles,
      openLoopRightHalfPlanePoles: count.openLoopOutsidePoles,
      openLoopOriginPoles: count.openLoopUnitPoles,
      highFrequencyLoopGain: 0,
      neutralType: false,
      sampledDataVerdict: poles.verdict,
      sampledDataLargestPoleMagnitude: poles.largestPoleMagnitude,
      sampledDataEncirclementVerdict: count.verdict,
      sampledDataEncirclementNote: count.reason,
      sampledDataClosedLoopOutsidePoles: count.closedLoopOutsidePoles,
    },
  };
}
