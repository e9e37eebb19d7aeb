/**
 * Stability and robustness of one loop L = C·G (DOMAIN.md §5). Absent margins are null.
 * Gain margins in dB: lower (reducing the gain by this much destabilises; reported as a
 * negative dB figure, e.g. −15.6 dB) and upper (raising the gain by this much destabilises).
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
}
