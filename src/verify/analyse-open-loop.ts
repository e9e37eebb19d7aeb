/**
 * Stability and robustness of one loop L(s): every gain and phase crossover, phase margin, both
 * gain margins, delay margin, sensitivity peaks, and a verdict from one decisive test with an
 * independent cross-check (decision.ts).
 */
import { radiansToDegrees, ratioToDecibels } from '../core/units.js';
import { continuousDecision, sampledDecision } from './decision.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { confirmedDelayMargin } from './delay-margin.js';
import { evaluateLoopResponse, newLoopPoint } from './loop-response.js';
import { sampledPlant, type SampledPlant } from './sampled-plant.js';
import { sampledNyquistCount } from './sampled-nyquist.js';
import { sensitivityPeaks } from './sensitivity.js';
import { cancelCommonIntegrators, sweepLoop, type Sweep } from './sweep.js';
import type { AnalysisScope, LoopMargins, OpenLoop } from './types.js';
import { validateOpenLoop } from './validate-loop.js';
import { checkAnalysisBounds } from './analysis-bounds.js';

export { ANALYSIS_DEFAULTS };

/** The signed phase margin at a gain crossover from its continuous phase: 180° + ∠L wrapped into (−180°, 180°], rad. */
export function phaseMarginFromPhase(phase_rad: number): number {
  const x = phase_rad + Math.PI;
  return x - 2 * Math.PI * Math.ceil((x - Math.PI) / (2 * Math.PI));
}

const finite = (value: number): number => (Number.isFinite(value) ? value : Number.MAX_VALUE);

/**
 * How much of the analysis to do. 'full' (the default): everything below. 'figures', for searches that
 * analyse many neighbouring loops and analyse the ones they keep in full: the same verdict, margins and
 * peaks, but no Nyquist cross-check of the verdict (the closed-loop poles decide either way) and the delay
 * margin as its crossover estimate, not confirmed by the exact verdict (it may promise more than the loop
 * tolerates where a fraction of a sample matters; `analysis.delayMarginNote` says it is an estimate).
 */
export interface AnalysisOptions {
  readonly scope?: AnalysisScope;
}

/** The delay margin's crossover estimate min φᵢ/ωᵢ, unconfirmed (scope 'figures'). */
function delayMarginEstimate(crossovers: readonly { frequency_radps: number; signed_rad: number }[]): {
  delayMargin_s: number | null;
  frequency_radps: number | null;
  note: string | null;
} {
  let best: { delayMargin_s: number; frequency_radps: number } | null = null;
  for (const c of crossovers) {
    const needed = (c.signed_rad > 0 ? c.signed_rad : c.signed_rad + 2 * Math.PI) / c.frequency_radps;
    if (best === null || needed < best.delayMargin_s) best = { delayMargin_s: needed, frequency_radps: c.frequency_radps };
  }
  return best === null
    ? { delayMargin_s: null, frequency_radps: null, note: null }
    : { ...best, note: 'the crossover estimate, not confirmed by the exact verdict (analysis scope "figures")' };
}

/**
 * Analyse the open loop L(s) = N(s)/D(s)·e^(−θs) of a unity negative-feedback loop
 * (closed loop 1 + L = 0), optionally with a discrete controller C(z): the loop is then the
 * sampled loop L(e^(jωTs)) = C(e^(jωTs))·G_zoh(e^(jωTs)) for 0 < ω ≤ π/Ts, G_zoh the exact
 * zero-order-hold equivalent of the plant with its fractional delay (`sampledPlant`).
 * Frequencies rad/s, phases in degrees, gain margins in dB (20·log10 of the gain factor).
 *
 * - Verdict (decision.ts): sampled loop — its exact closed-loop poles with a bound on their
 *   rounding error decide, the Nyquist count on its pulse frequency response cross-checks;
 *   continuous loop — the closed-loop poles with a Padé delay decide, the exact-delay Nyquist
 *   count cross-checks. 'marginal' only when the deciding pole lies on the boundary within the
 *   stated numerical tolerance (named in analysis.verdictNote).
 * - Gain crossovers (|L| = 1), refined by Brent's method. Phase margin (the convention of
 *   `LoopMargins.phaseMargin_deg`): at each crossover the smallest phase change, lag or lead,
 *   that puts L on −1, |180° + ∠L| wrapped into [0°, 180°]; the smallest over the crossovers,
 *   with its frequency and direction. Null on a loop that is not stable (the signed figures stay
 *   in analysis.gainCrossovers).
 * - Delay margin (stable loops only; delay-margin.ts): the phase lag φᵢ ∈ (0°, 360°) of each
 *   crossover over its frequency, the smallest, confirmed or shortened by the exact verdict of
 *   the loop with that delay added.
 * - Phase crossovers (∠L = −180°·(2k + 1)) and, for a loop without integrators whose L(0) is
 *   negative, ω = 0 (and ω = π/Ts of a sampled loop when L is negative there): each is a gain
 *   factor 1/|L| at which −1 lies on the curve. Upper gain margin = the smallest factor > 1,
 *   lower = the largest factor < 1, reported as a negative dB figure (reducing the gain
 *   destabilises, as in a conditionally stable double integrator with PID). Null when there is
 *   none, and on a loop that is not stable.
 * - Ms = max|1/(1 + L)| and Mt = max|L/(1 + L)|, refined by golden-section search.
 * The work is bounded for any input (analysis-bounds.ts): past the bounds a typed error
 * `verify.analysisTooLarge` names the cause. Throws `verify.invalidLoop` / `verify.improperLoop`
 * on bad input.
 */
export function analyseOpenLoop(input: OpenLoop, options: AnalysisOptions = {}): LoopMargins {
  const loop = validateOpenLoop(input);
  checkAnalysisBounds(loop);
  const scope = options.scope ?? 'full';
  const full = scope === 'full';
  const { numerator, denominator } = cancelCommonIntegrators(loop.numerator, loop.denominator);
  const discrete = loop.discreteController ?? null;
  const plant = discrete === null ? null : sampledPlant({ numerator, denominator, delay_s: loop.delay_s }, discrete.sampleTime_s);
  const sweep = sweepLoop({ numerator, denominator, delay_s: loop.delay_s, discreteController: discrete, sampledPlant: plant, crossings: 'gainAndPhase' });
  const decision =
    discrete === null || plant === null ? continuousDecision(numerator, denominator, loop.delay_s, sweep) : sampledDecision(plant, discrete, sweep, scope);
  const { verdict } = decision;
  const stable = verdict === 'stable';

  const crossovers = sweep.gainCrossovers.map((c) => ({ frequency_radps: c.frequency_radps, signed_rad: phaseMarginFromPhase(c.phase_rad) }));
  let phaseMargin: { value: number; frequency: number; direction: 'lag' | 'lead' } | null = null;
  for (const c of crossovers) {
    const size = Math.abs(c.signed_rad);
    if (phaseMargin === null || size < phaseMargin.value)
      phaseMargin = { value: size, frequency: c.frequency_radps, direction: c.signed_rad >= 0 ? 'lag' : 'lead' };
  }
  const critical = criticalCrossings(sweep, numerator, loop);
  const gains = stable ? gainMargins(critical) : { lower: null, upper: null };
  const delay = !stable
    ? { delayMargin_s: null, frequency_radps: null, note: null }
    : !full
      ? delayMarginEstimate(crossovers)
      : confirmedDelayMargin({
          crossovers: crossovers.map((c) => ({ frequency_radps: c.frequency_radps, lag_rad: c.signed_rad > 0 ? c.signed_rad : c.signed_rad + 2 * Math.PI })),
          sampleTime_s: discrete === null ? null : discrete.sampleTime_s,
          fractionSensitive:
            discrete !== null && fractionSensitive(sweep, discrete.sampleTime_s, decision.details.sampledDataHighFrequencyPoleMagnitude ?? null),
          stableWithAddedDelay: (added_s) => stableWithAddedDelay({ ...loop, numerator, denominator }, added_s, sweep, plant),
        });
  const peaks = sensitivityPeaks(sweep.compiled, sweep.grid, ANALYSIS_DEFAULTS.peakLogFrequencyTolerance);

  return {
    stable,
    verdict,
    phaseMargin_deg: stable && phaseMargin !== null ? radiansToDegrees(phaseMargin.value) : null,
    phaseMarginFrequency_radps: stable && phaseMargin !== null ? phaseMargin.frequency : null,
    phaseMarginDirection: stable && phaseMargin !== null ? phaseMargin.direction : null,
    lowerGainMargin_dB: gains.lower === null ? null : ratioToDecibels(1 / gains.lower.magnitude),
    lowerGainMarginFrequency_radps: gains.lower === null ? null : gains.lower.frequency,
    upperGainMargin_dB: gains.upper === null ? null : ratioToDecibels(1 / gains.upper.magnitude),
    upperGainMarginFrequency_radps: gains.upper === null ? null : gains.upper.frequency,
    delayMargin_s: delay.delayMargin_s,
    delayMarginFrequency_radps: delay.frequency_radps,
    // A grid point exactly on −1 would give an infinite peak: report the largest finite number instead (never Infinity).
    sensitivityPeak: finite(peaks.sensitivity.value),
    sensitivityPeakFrequency_radps: peaks.sensitivity.frequency_radps,
    complementarySensitivityPeak: finite(peaks.complementary.value),
    complementarySensitivityPeakFrequency_radps: peaks.complementary.frequency_radps,
    analysis: {
      ...decision.details,
      gainCrossovers: crossovers.map((c) => ({ frequency_radps: c.frequency_radps, phaseMargin_deg: radiansToDegrees(c.signed_rad) })),
      phaseCrossovers: critical.map((c) => ({ frequency_radps: c.frequency_radps, gainMargin_dB: ratioToDecibels(1 / c.magnitude) })),
      delayMarginNote: delay.note,
      bandLow_radps: sweep.band.low_radps,
      bandHigh_radps: sweep.band.high_radps,
    },
  };
}

/**
 * The exact verdict of the same loop with a longer delay (the delay-margin trials). Continuous: the
 * decisive pole test with its cross-check (decision.ts). Sampled: the argument principle on the exact
 * pulse frequency response of the loop with the delay added (sampled-nyquist.ts) — exact, and its work
 * does not grow with the added whole samples as an eigenvalue problem's would (N³).
 */
function stableWithAddedDelay(loop: OpenLoop, added_s: number, sweep: Sweep, nominal: SampledPlant | null): boolean {
  const discrete = loop.discreteController ?? null;
  const delay_s = loop.delay_s + added_s;
  if (discrete === null || nominal === null) {
    const trial = sweepLoop({
      numerator: loop.numerator,
      denominator: loop.denominator,
      delay_s,
      discreteController: null,
      sampledPlant: null,
      crossings: 'phaseOnly',
    });
    return continuousDecision(loop.numerator, loop.denominator, delay_s, trial).verdict === 'stable';
  }
  // Whole samples added: z^(−k) on the nominal sampled plant, exactly, without a new discretisation.
  const samples = added_s / discrete.sampleTime_s;
  const whole = Math.round(samples);
  if (whole >= 1 && Math.abs(samples - whole) <= 1e-9 * samples) {
    return (
      sampledNyquistCount(nominal, discrete, sweep, { extraWholeSamples: whole, pulseNumerator: sweep.compiled.sampled?.pulse.numerator }).verdict === 'stable'
    );
  }
  const plant = sampledPlant({ numerator: loop.numerator, denominator: loop.denominator, delay_s }, discrete.sampleTime_s);
  return sampledNyquistCount(plant, discrete, sweep).verdict === 'stable';
}

/**
 * Whether a fraction of a sample of delay may matter anywhere below two samples: |L| reaches
 * `upperBandMagnitude` (0.5) in the upper half of a sampled loop's band (π/(2Ts) … π/Ts), or a closed-loop pole
 * at high frequency (|arg z| ≥ π/2) has |z| ≥ `highFrequencyPoleMagnitude` (0.9: within 0.1 of the unit circle),
 * or the poles are not known.
 */
function fractionSensitive(sweep: Sweep, sampleTime_s: number, highFrequencyPole: number | null): boolean {
  if (highFrequencyPole === null || highFrequencyPole >= ANALYSIS_DEFAULTS.delayMargin.highFrequencyPoleMagnitude) return true;
  const { frequency_radps: w, magnitude } = sweep.grid;
  const from = Math.PI / (2 * sampleTime_s);
  for (let i = w.length - 1; i >= 0 && w[i] >= from; i--) if (magnitude[i] >= ANALYSIS_DEFAULTS.delayMargin.upperBandMagnitude) return true;
  return false;
}

/** Crossings of the negative real axis (refined), plus ω = 0 and ω = π/Ts where L is real and negative. */
function criticalCrossings(sweep: Sweep, numerator: readonly number[], loop: OpenLoop): { frequency_radps: number; magnitude: number }[] {
  const critical = sweep.phaseCrossovers.filter((c) => c.refined).map((c) => ({ frequency_radps: c.frequency_radps, magnitude: c.magnitude }));
  const discrete = loop.discreteController ?? null;
  const mLast = sweep.compiled.denominator[sweep.compiled.denominator.length - 1];
  // ω = 0: L(0) real and negative (no integrator) is a critical gain too; a discrete controller contributes C(z = 1).
  const sum = (values: readonly number[]): number => values.reduce((total, value) => total + value, 0);
  // A controller pole at z = 1 (an integrator) leaves rounding residue in the sum of its denominator: no finite L(0) then.
  const atOne = (values: readonly number[]): boolean => Math.abs(sum(values)) <= ANALYSIS_DEFAULTS.sampledNyquist.circleTolerance * sum(values.map(Math.abs));
  const discreteDc = discrete === null ? 1 : atOne(discrete.denominator) ? Number.NaN : sum(discrete.numerator) / sum(discrete.denominator);
  if (sweep.originPoles === 0 && mLast !== 0 && Number.isFinite(discreteDc)) {
    const zeroValue = (numerator[numerator.length - 1] / mLast) * discreteDc;
    if (zeroValue < 0) critical.push({ frequency_radps: 0, magnitude: -zeroValue });
  }
  // ω = π/Ts on a sampled loop: L(e^(jπ)) is real; negative, it is a crossing of the negative real axis at the band's end.
  if (sweep.compiled.sampled !== null && discrete !== null) {
    const nyquist_radps = Math.PI / discrete.sampleTime_s;
    const point = newLoopPoint();
    evaluateLoopResponse(sweep.compiled, nyquist_radps, point);
    const known = critical.some((c) => Math.abs(c.frequency_radps - nyquist_radps) <= ANALYSIS_DEFAULTS.frequencyRelativeTolerance * 1e3 * nyquist_radps);
    if (point.re < 0 && !known) critical.push({ frequency_radps: nyquist_radps, magnitude: point.magnitude });
  }
  return critical;
}

type Crossing = { magnitude: number; frequency: number };

/** Lower and upper gain margins of a stable loop from its critical crossings. */
function gainMargins(critical: readonly { frequency_radps: number; magnitude: number }[]): { lower: Crossing | null; upper: Crossing | null } {
  let lower: Crossing | null = null;
  let upper: Crossing | null = null;
  for (const c of critical) {
    if (c.magnitude > 1 && (lower === null || c.magnitude < lower.magnitude)) lower = { magnitude: c.magnitude, frequency: c.frequency_radps };
    if (c.magnitude < 1 && c.magnitude > 0 && (upper === null || c.magnitude > upper.magnitude))
      upper = { magnitude: c.magnitude, frequency: c.frequency_radps };
  }
  return { lower, upper };
}
