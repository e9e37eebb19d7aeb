/**
 * A constructed loop with margins in closed form, for checking the dense check and refinement
 * without the real loop analysis: plant G_v(s) = v²·e^(−θs)/s at speed v (an integrating plant
 * whose gain grows like v²) under a P controller kp, so L(s) = k·e^(−θs)/s with k = kp·v².
 *
 * Closed form (Åström & Murray 2008, Feedback Systems, integrator with delay; docs/domain.md §5b:
 * k·e^(−θs)/s is stable iff kθ < π/2): gain crossover ωc = k; phase margin 90° − kθ·180/π;
 * delay margin (π/2 − kθ)/k; phase crossover ω180 = π/(2θ), upper gain margin π/(2kθ);
 * no lower gain margin. Peak sensitivity by a fine frequency sweep.
 */
import type { PidGains } from '../../src/controller/types.js';
import type { LoopMargins } from '../../src/verify/types.js';

export const LOOP_DELAY_S = 0.1;

/** The ideal gain giving kθ = π/6 at every speed: phase margin 60°, upper gain margin 3 (9.54 dB). */
export const idealGains = (speed_mps: number): PidGains => ({ kp: Math.PI / 6 / LOOP_DELAY_S / (speed_mps * speed_mps), ki: 0, kd: 0 });

export function integratorLoopMargins(speed_mps: number, gains: PidGains): LoopMargins {
  const k = gains.kp * speed_mps * speed_mps;
  const theta = LOOP_DELAY_S;
  const phaseMargin_rad = Math.PI / 2 - k * theta;
  let peak = 0;
  let peakFrequency = 0;
  let complementaryPeak = 0;
  let complementaryFrequency = 0;
  for (let i = 0; i <= 400; i += 1) {
    const w = (k / 100) * Math.pow(10, (4 * i) / 400);
    const re = 1 + (k / w) * -Math.sin(w * theta);
    const im = (k / w) * -Math.cos(w * theta);
    const s = 1 / Math.hypot(re, im);
    if (s > peak) {
      peak = s;
      peakFrequency = w;
    }
    // |T| = |L|·|S|, |L| = k/ω.
    const t = (k / w) * s;
    if (t > complementaryPeak) {
      complementaryPeak = t;
      complementaryFrequency = w;
    }
  }
  const stable = k * theta < Math.PI / 2;
  return {
    stable,
    verdict: stable ? 'stable' : 'unstable',
    // Margins are distances to instability: null on an unstable loop (as analyseOpenLoop reports them).
    phaseMargin_deg: stable ? (phaseMargin_rad * 180) / Math.PI : null,
    phaseMarginFrequency_radps: stable ? k : null,
    phaseMarginDirection: stable ? 'lag' : null,
    lowerGainMargin_dB: null,
    lowerGainMarginFrequency_radps: null,
    upperGainMargin_dB: stable ? 20 * Math.log10(Math.PI / (2 * k * theta)) : null,
    upperGainMarginFrequency_radps: stable ? Math.PI / (2 * theta) : null,
    delayMargin_s: stable ? phaseMargin_rad / k : null,
    delayMarginFrequency_radps: stable ? k : null,
    sensitivityPeak: peak,
    sensitivityPeakFrequency_radps: peakFrequency,
    complementarySensitivityPeak: complementaryPeak,
    complementarySensitivityPeakFrequency_radps: complementaryFrequency,
  };
}
