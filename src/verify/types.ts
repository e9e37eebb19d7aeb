/** How much of a loop analysis to do: 'full', or 'figures' without the Nyquist cross-check and the delay margin's confirmation (AnalysisOptions). */
export type AnalysisScope = 'full' | 'figures';

/**
 * Stability and robustness of one loop L = C·G.
 * Absent margins are null. Margins are distances to instability: on a loop that is not stable
 * the phase, gain and delay margins are all null (the signed figures at every crossing stay in
 * `analysis`). Gain margins in dB: lower (reducing the gain by this much destabilises; reported
 * as a negative dB figure, e.g. −15.6 dB) and upper (raising the gain by this much destabilises).
 */
export interface LoopMargins {
  readonly stable: boolean;
  /**
   * 'stable' or 'unstable', decided by the closed-loop poles; 'marginal' when the deciding pole
   * lies on the stability boundary within the stated numerical tolerance (analysis.verdictNote
   * names it and its distance from the boundary). A marginal loop is not stable.
   */
  readonly verdict: 'stable' | 'unstable' | 'marginal';
  /**
   * Phase margin, degrees in (0°, 180°]: at each gain crossover, the smallest change of phase —
   * lag, as usual, or lead — that puts L on −1 there, |180° + ∠L| with the angle wrapped into
   * (−180°, 180°]; the smallest over the crossovers. Never negative on a stable loop. Null when
   * there is no gain crossover or the loop is not stable.
   */
  readonly phaseMargin_deg: number | null;
  readonly phaseMarginFrequency_radps: number | null;
  /** Which way the phase would have to change at that crossover: 'lag' (the usual case) or 'lead'. */
  readonly phaseMarginDirection: 'lag' | 'lead' | null;
  readonly lowerGainMargin_dB: number | null;
  readonly lowerGainMarginFrequency_radps: number | null;
  readonly upperGainMargin_dB: number | null;
  readonly upperGainMarginFrequency_radps: number | null;
  /**
   * Delay margin, s: the smallest delay added in the loop that makes it unstable, from the gain
   * crossovers (phase lag over frequency) and confirmed — or shortened — by the exact verdict of the
   * loop with that delay added (src/verify/delay-margin.ts). Null when no delay destabilises or the
   * loop is not stable.
   */
  readonly delayMargin_s: number | null;
  /** The gain crossover whose phase lag sets the delay margin, rad/s; null when the exact verdict shortened it or there is none. */
  readonly delayMarginFrequency_radps: number | null;
  /** Peak of |1/(1 + L)|. */
  readonly sensitivityPeak: number;
  readonly sensitivityPeakFrequency_radps: number;
  /** Peak of |L/(1 + L)|. */
  readonly complementarySensitivityPeak: number;
  readonly complementarySensitivityPeakFrequency_radps: number;
  /** How the verdict and margins were reached (optional; filled by analyseOpenLoop). */
  readonly analysis?: LoopAnalysisDetails;
}

/** One closed-loop pole in z with the bound of its rounding error (sampled loops). */
export interface ClosedLoopPoleRecord {
  readonly re: number;
  readonly im: number;
  readonly magnitude: number;
  readonly errorBound: number;
}

/** The evidence behind a `LoopMargins` verdict: the deciding test, its cross-check and every crossing found. */
export interface LoopAnalysisDetails {
  /** The test that decided the verdict. */
  readonly decidedBy: 'sampled-data closed-loop poles' | 'sampled-data argument principle' | 'closed-loop poles with a Padé delay' | 'neutral-type loop';
  /** Why the verdict is marginal (the pole and its distance from the boundary), or how it was reached when not by poles; null otherwise. */
  readonly verdictNote: string | null;
  /** Whether the independent Nyquist count agrees with the deciding test (null when it could not count). A disagreement is a defect of the analysis, not of the loop: report it. */
  readonly crossCheckAgrees: boolean | null;
  /** From the roots of the closed-loop polynomial (continuous loop: the delay as a Padé approximant; sampled loop: the exact closed-loop eigenvalues). */
  readonly closedLoopPoleVerdict: 'stable' | 'unstable' | 'marginal';
  /** Padé order of the continuous pole test (0 for a sampled loop, whose delay is exact). */
  readonly padeOrder: number;
  /** Continuous loop: largest real part of the closed-loop poles with the Padé delay, 1/s (null for a sampled loop). */
  readonly rightmostClosedLoopPoleRealPart_perS: number | null;
  /** From the Nyquist encirclement count with the exact delay; 'undetermined' with a reason when it cannot be counted. */
  readonly encirclementVerdict: 'stable' | 'unstable' | 'marginal' | 'undetermined';
  readonly encirclementNote: string | null;
  /** Z = N + P: closed-loop poles in the right half-plane (outside the unit circle, sampled) by the encirclement count. */
  readonly closedLoopRightHalfPlanePoles: number | null;
  /** P: open-loop poles in the open right half-plane (outside the unit circle, sampled). */
  readonly openLoopRightHalfPlanePoles: number;
  /** Open-loop poles at the origin (at z = 1, sampled, including the controller's integrator). */
  readonly openLoopOriginPoles: number;
  /** |L(j∞)| (0 for a strictly proper loop); ≥ 1 with a delay is a neutral-type loop, unstable. */
  readonly highFrequencyLoopGain: number;
  readonly neutralType: boolean;
  /** With a discrete controller: the exact sampled-data verdict (closed-loop eigenvalues in z, `sampledLoopVerdict`). */
  readonly sampledDataVerdict?: 'stable' | 'unstable' | 'marginal';
  /** With a discrete controller: the largest closed-loop pole magnitude |z| (null when decided by the argument principle). */
  readonly sampledDataLargestPoleMagnitude?: number | null;
  /** With a discrete controller: the pole with the largest |z| and the bound of its rounding error. */
  readonly sampledDataDecidingPole?: ClosedLoopPoleRecord | null;
  /** With a discrete controller: −Ts/ln|z| of the slowest closed-loop pole, s. */
  readonly sampledDataSlowestTimeConstant_s?: number | null;
  /** With a discrete controller: the largest |z| of the closed-loop poles with |arg z| ≥ π/2 (null when not known). */
  readonly sampledDataHighFrequencyPoleMagnitude?: number | null;
  /** With a discrete controller: the Nyquist count on the exact pulse frequency response of the sampled loop (the cross-check). */
  readonly sampledDataEncirclementVerdict?: 'stable' | 'unstable' | 'marginal' | 'undetermined';
  readonly sampledDataEncirclementNote?: string | null;
  /** With a discrete controller: closed-loop poles outside the unit circle by that count (null when not counted). */
  readonly sampledDataClosedLoopOutsidePoles?: number | null;
  /** Every gain crossover: frequency and its signed phase margin 180° + ∠L wrapped into (−180°, 180°] (negative: lead reaches −1 first). */
  readonly gainCrossovers: ReadonlyArray<{ readonly frequency_radps: number; readonly phaseMargin_deg: number }>;
  /** Every crossing of the negative real axis with |L| ≥ 0.5 (and the largest below): frequency and the gain change that reaches −1, dB. */
  readonly phaseCrossovers: ReadonlyArray<{ readonly frequency_radps: number; readonly gainMargin_dB: number }>;
  /** How the delay margin was confirmed, in words (null when there is none). */
  readonly delayMarginNote: string | null;
  /** Frequency band analysed, rad/s. */
  readonly bandLow_radps: number;
  readonly bandHigh_radps: number;
}

/**
 * A discrete controller C(z) in the loop, evaluated on the unit circle z = e^(jωTs).
 * Coefficients in powers of z, highest first. The loop is analysed exactly as sampled:
 * margins, Ms and Mt on C(e^(jωTs))·G_zoh(e^(jωTs)), 0 < ω ≤ π/Ts, with G_zoh the plant's
 * zero-order-hold equivalent including the fractional delay (src/verify/sampled-plant.ts),
 * and the stability verdict on the same sampled-data loop (sampled-verdict.ts and
 * sampled-nyquist.ts). `continuousCounterpart` is the C(s) that C(z) implements.
 */
export interface DiscreteControllerFactor {
  readonly numerator: readonly number[];
  readonly denominator: readonly number[];
  readonly sampleTime_s: number;
  /** The continuous controller C(s) that C(z) implements (its delay field must be 0). */
  readonly continuousCounterpart: { readonly numerator: readonly number[]; readonly denominator: readonly number[] };
}

/**
 * An open loop L = N(s)/D(s)·e^(−delay_s·s) [sampled through a zero-order hold under C(z)] in the
 * negative-feedback sign convention: closed loop 1 + L = 0. `continuous` holds the
 * plant (with its delay and any computation latency) and, for a continuous
 * controller, the controller too. Coefficients highest power first.
 */
export interface OpenLoop {
  readonly numerator: readonly number[];
  readonly denominator: readonly number[];
  readonly delay_s: number;
  readonly discreteController?: DiscreteControllerFactor;
}
