import type { ControllerType } from './types.js';

/**
 * Every default of the tuning rules, in one place. Values with a source say so; the rest are our
 * choices, documented here and in `speedband tune --help`.
 */
export const TUNING_DEFAULTS = {
  /** Ziegler–Nichols rows to use when the user names none. */
  controllerType: 'PID' as ControllerType,
  /** IMC-PID λ/θ. Rivera, Morari & Skogestad (1986) advise λ > 0.8·θ for the PID with first-order Padé (from memory). */
  imcLambdaPerDeadTime: 1,
  /** IMC-PID advised lower bound of λ/θ (from memory: Rivera, Morari & Skogestad 1986, "λ/θ > 0.8"). */
  imcMinimumLambdaPerDeadTime: 0.8,
  /** SIMC τc/θ: τc = θ, "tight control with good robustness" (Skogestad 2003). */
  simcTauCPerDeadTime: 1,
  /** Damping-target ζ: critically damped, no overshoot of the path (common practice for lateral control). */
  dampingRatio: 1,
  /** Damping-target ωn/p: the integral pole a factor 5 below ωn keeps the integral term gentle (docs/domain.md §4). */
  integralPoleRatio: 5,
  /**
   * Damping-target ωn when neither ωn nor a settling distance is given: ωn·θ_eff = this value,
   * with θ_eff the design model's effective delay (half rule). Our choice: half the warning bound.
   */
  defaultBandwidthDelayProduct: 0.1,
  /**
   * Damping-target warning bound on ωn·θ_eff (θ_eff = delay + actuator and yaw lags by the half rule).
   * Our figure: at ζ = 1, ratio 5, ωn·θ = 0.2 leaves a phase margin of about 48° (delay-free: 74°) on k''e^(−θs)/s²
   * (recomputed in test/tuning/damping-target.test.ts).
   */
  maximumBandwidthDelayProduct: 0.2,
  /**
   * Damping-target on a path loop with a lead T0 (preview and sideslip): the delay-free design loop's
   * high-frequency gain |k''·kd·T0| must stay below this — at 1 the design loop no longer falls below
   * 1 at high frequency and the lag and delay the design neglects decide stability (the neutral-type
   * argument of docs/domain.md §5b). Over the demo fleet (2–25 m/s, previews 0–5 m, settling 5–80 m) every
   * design below 1 with ωn·θ_eff ≤ 0.2 came out stable on the full loop.
   */
  maximumPreviewHighFrequencyGain: 1,
  /** The default ωn keeps k''·kd·T0 at or below this. Our choice: half the limit. */
  defaultPreviewHighFrequencyGain: 0.5,
  /**
   * MIGO's bound on the sensitivity peaks: M = 1.4, the robustness Åström & Hägglund use for MIGO and AMIGO
   * (Åström & Hägglund 2004, J. Process Control 14; 2006, Advanced PID Control, §7.4 — from memory).
   */
  sensitivityPeakTarget: 1.4,
  /**
   * SIMC on a path loop with a lead T0 (preview and sideslip): the lead is neglected when T0 ≤ this × (τc + θ),
   * and cancels an integrator (k''(T0 s + 1)/s² ≈ k''T0/s) when T0 ≥ integratorLeadPerHorizon × (τc + θ).
   * Our reading of Skogestad's (2003, §3.1) rule for positive numerator time constants against the
   * closed-loop time constant; in between neither model holds in the band the rule designs for, and SIMC refuses.
   */
  negligibleLeadPerHorizon: 0.5,
  integratorLeadPerHorizon: 4,
} as const;
