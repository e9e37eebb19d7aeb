import { describe, expect, it } from 'vitest';
import { fastestPassing, freeParameterOf, limitsWithRoom } from '../../src/pipeline/fastest-passing.js';
import type { BreakpointEvaluation } from '../../src/pipeline/breakpoint-evaluation.js';
import type { TunedOperatingPoint } from '../../src/tuning/operating-point.js';
import type { RuleParameters } from '../../src/tuning/types.js';
import { THRESHOLD_DEFAULTS } from '../../src/schedule/dense-check.js';

/** A stand-in rule: kp = 1/τc; design dead time 0.1 s (the ladder runs from 0.025 s to 1.6 s). */
const tune = (parameters: RuleParameters): TunedOperatingPoint =>
  ({
    gains: { kp: 1 / (parameters.simcClosedLoopTimeConstant_s ?? 0.1), ki: 0, kd: 0 },
    derivation: { designModel: { integrators: 0, gain: 1, lags_s: [], deadTime_s: 0.1 }, intermediate: {} },
  }) as unknown as TunedOperatingPoint;
/** Passes when τc lies in [low, high] (too fast breaks a margin, too slow a recovery time). */
const evaluateWithin =
  (low: number, high: number) =>
  (gains: { kp: number }): BreakpointEvaluation => {
    const tauC = 1 / gains.kp;
    const failures = tauC < low ? ['phase margin'] : tauC > high ? ['recovery time'] : [];
    return { failures, severity: failures.length } as unknown as BreakpointEvaluation;
  };
const input = (low: number, high: number) => ({
  rule: 'simc' as const,
  speed_mps: 5,
  parameters: {},
  tune,
  evaluate: evaluateWithin(low, high),
  sensitivityLimits: { sensitivity: 2, complementary: 2 },
  phaseMarginLimit_deg: 46,
});

describe('fastestPassing', () => {
  it('finds the fast end of the passing interval by the ladder and then bisection, and says which faster value failed and why', () => {
    const result = fastestPassing(input(0.33, 1));
    const tauC = result.record.value;
    expect(tauC).toBeGreaterThanOrEqual(0.33);
    // Ladder steps are factors of about 1.4; four bisections bring the choice within 1.4^(1/16) of the boundary.
    expect(tauC / 0.33).toBeLessThan(Math.pow(1.43, 1 / 16) + 1e-9);
    expect(result.record.outcome).toBe('fastest passing');
    expect(result.record.reason).toMatch(/τc = .* meets every limit; τc = .* \(faster\) does not: phase margin/);
  });

  it('when no candidate passes, takes the one breaking the fewest limits and says so', () => {
    const result = fastestPassing({ ...input(0.33, 1), evaluate: () => ({ failures: ['a', 'b'], severity: 2 }) as unknown as BreakpointEvaluation });
    expect(result.record.outcome).toBe('none passed');
    expect(result.record.reason).toMatch(/no τc from .* meets every limit/);
  });

  it('refuses a rule without a free parameter with the rules that have one', () => {
    expect(() => freeParameterOf('amigo')).toThrow(
      expect.objectContaining({ code: 'plan.invalid', message: expect.stringMatching(/no free parameter.*simc, imc-pid, damping-target, migo/) }),
    );
  });

  it('aims inside the frequency-domain limits only (the time-domain ones are judged where they are searched)', () => {
    const limits = { maximumOvershoot_pct: 25, maximumRecoveryTime_s: 15, maximumLaneChangeError_m: 0.5, maximumCurveEntryError_m: 0.3 };
    const roomy = limitsWithRoom(THRESHOLD_DEFAULTS, limits);
    expect(roomy.limits).toEqual(limits);
    expect(roomy.thresholds.minimumPhaseMargin_deg).toBeGreaterThan(THRESHOLD_DEFAULTS.minimumPhaseMargin_deg);
    expect(roomy.thresholds.maximumSensitivityPeak).toBeLessThan(THRESHOLD_DEFAULTS.maximumSensitivityPeak);
  });
});
