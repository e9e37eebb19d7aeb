import { makeRandom } from '../../src/core/random.js';
import type { StepSignals } from '../../src/identify/step-signals.js';

/**
 * Synthetic ramped steps from the closed-form FOPDT response (independent of
 * src/identify/simulate-fopdt.ts): the response of K/(τs + 1) to a unit ramp starting
 * at 0 is r(t) = t − τ(1 − e^(−t/τ)) for t > 0 (textbook, e.g. Seborg et al. §5), so a
 * ramp of height A over Tr starting at t1, delayed by θ, gives
 *   y(t) = b + K·A/Tr·[r(t − t1 − θ) − r(t − t1 − θ − Tr)].
 */
export interface RampStep {
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
  readonly bias: number;
  readonly amplitude: number;
  readonly ramp_s: number;
  readonly samplePeriod_s: number;
  readonly samples: number;
  readonly preStepSamples: number;
  readonly noise: number;
  readonly seed: number;
}

export const RAMP_STEP: RampStep = {
  gain: 2.5,
  timeConstant_s: 0.35,
  deadTime_s: 0.12,
  bias: 0.002,
  amplitude: 0.03,
  ramp_s: 0.15,
  samplePeriod_s: 0.01,
  samples: 1000,
  preStepSamples: 100,
  noise: 0.004,
  seed: 1,
};

const rampResponse = (t: number, tau: number): number => (t > 0 ? t - tau * (1 - Math.exp(-t / tau)) : 0);

export function rampStepSignals(overrides: Partial<RampStep> = {}): StepSignals & { readonly clean: Float64Array } {
  const c = { ...RAMP_STEP, ...overrides };
  const random = makeRandom(c.seed);
  const t1 = c.preStepSamples * c.samplePeriod_s;
  const time_s = new Float64Array(c.samples);
  const input = new Float64Array(c.samples);
  const output = new Float64Array(c.samples);
  const clean = new Float64Array(c.samples);
  for (let i = 0; i < c.samples; i++) {
    const t = i * c.samplePeriod_s;
    time_s[i] = t;
    input[i] = c.amplitude * Math.min(1, Math.max(0, (t - t1) / c.ramp_s));
    const tp = t - t1 - c.deadTime_s;
    clean[i] = c.bias + ((c.gain * c.amplitude) / c.ramp_s) * (rampResponse(tp, c.timeConstant_s) - rampResponse(tp - c.ramp_s, c.timeConstant_s));
    output[i] = clean[i] + c.noise * random.normal();
  }
  return { time_s, input, output, preStepSamples: c.preStepSamples, clean };
}

/** A segmented-step record around synthetic ramp-step signals (as src/log/segment.ts would give). */
export function rampStepTest(
  overrides: Partial<RampStep> & { readonly file?: string; readonly stepIndex?: number; readonly speed_mps?: number } = {},
): import('../../src/log/types.js').StepTest {
  const signals = rampStepSignals(overrides);
  const amplitude = overrides.amplitude ?? RAMP_STEP.amplitude;
  return {
    file: overrides.file ?? 'synthetic.csv',
    segmentIndex: 0,
    stepIndex: overrides.stepIndex ?? 0,
    onset_s: signals.time_s[signals.preStepSamples],
    amplitude_rad: amplitude,
    direction: amplitude >= 0 ? 'left' : 'right',
    speed_mps: overrides.speed_mps ?? 10,
    speedSpread_mps: 0.05,
    time_s: signals.time_s,
    steerCommand_rad: signals.input,
    yawRate_radps: signals.output,
    preStepSamples: signals.preStepSamples,
    metrics: { steadyYawGain_perS: overrides.gain ?? RAMP_STEP.gain, responseTime_s: null, peakResponseTime_s: null, overshoot_pct: 0 },
  };
}
