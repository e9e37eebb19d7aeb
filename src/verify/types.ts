/**
 * Stability and robustness of one loop L = C·G (DOMAIN.md §5). Absent margins are null.
 * Gain margins in dB: lower (reducing the gain by this much destabilises; reported as a
 * negative dB figure, e.g. −15.6 dB) and upper (raising the gain by this much destabilises).
 * On a loop that is not stable both gain margins are null: they do not apply.
 */
export interface LoopMargins {
  readonly stable: boolean;
  /** 'stable' | 'unstable' | 'undetermined' (pole and Nyquist verdicts disagree). */
  readonly verdict: 'stable' | 'unstable' | 'undetermined';
  /** Smallest phase margin over all gain crossovers, degrees in (−180, 180]. */
  readonly phaseMargin_deg: number | null;
  readonly phaseMarginFrequency_radps: number | null;
  readonly lowerGainMargin_dB: number | null;
  readonly lowerGainMarginFrequency_radps: number | null;
  readonly upperGainMargin_dB: number | null;
  readonly upperGainMarginFrequency_radps: number | null;
  /** min over gain crossovers of PM_i/ωc_i, s. */
  readonly delayMargin_s: number | null;
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

/** The evidence behind a `LoopMargins` verdict: both stability tests and every crossing found. */
export interface LoopAnalysisDetails {
  /** From the roots of the closed-loop polynomial with the delay as a Padé approximant. */
  readonly closedLoopPoleVerdict: 'stable' | 'unstable' | 'marginal';
  readonly padeOrder: number;
  /** From the Nyquist encirclement count with the exact delay; 'undetermined' with a reason when it cannot be counted. */
  readonly encirclementVerdict: 'stable' | 'unstable' | 'marginal' | 'undetermined';
  readonly encirclementNote: string | null;
  /** Z = N + P: closed-loop poles in the right half-plane by the encirclement count. */
  readonly closedLoopRightHalfPlanePoles: number | null;
  /** P: open-loop poles in the open right half-plane. */
  readonly openLoopRightHalfPlanePoles: number;
  /** Open-loop poles at the origin (within the axis tolerance). */
  readonly openLoopOriginPoles: number;
  /** |L(j∞)| (0 for a strictly proper loop); ≥ 1 with a delay is a neutral-type loop, unstable. */
  readonly highFrequencyLoopGain: number;
  readonly neutralType: boolean;
  /** Every gain crossover: frequency and its phase margin. */
  readonly gainCrossovers: ReadonlyArray<{ readonly frequency_radps: number; readonly phaseMargin_deg: number }>;
  /** Every crossing of the negative real axis with |L| ≥ 0.5 (and the largest below): frequency and the gain change that reaches −1, dB. */
  readonly phaseCrossovers: ReadonlyArray<{ readonly frequency_radps: number; readonly gainMargin_dB: number }>;
  /** Frequency band analysed, rad/s. */
  readonly bandLow_radps: number;
  readonly bandHigh_radps: number;
  /** With a discrete controller: the exact sampled-data verdict (closed-loop eigenvalues in z, `sampledLoopVerdict`). */
  readonly sampledDataVerdict?: 'stable' | 'unstable' | 'marginal';
  /** With a discrete controller: the largest closed-loop eigenvalue magnitude |z| of the sampled-data loop. */
  readonly sampledDataLargestPoleMagnitude?: number;
  /** With a discrete controller: the Nyquist count on the exact pulse frequency response of the sampled loop. */
  readonly sampledDataEncirclementVerdict?: 'stable' | 'unstable' | 'marginal' | 'undetermined';
  readonly sampledDataEncirclementNote?: string | null;
  /** With a discrete controller: closed-loop poles outside the unit circle by that count (null when not counted). */
  readonly sampledDataClosedLoopOutsidePoles?: number | null;
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
