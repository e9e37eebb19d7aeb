import type { FopdtModel } from './types.js';
import { fitStepModel, type BiasMode, type StepModelDefinition, type StepModelFit } from './fit-step-model.js';
import { delayedFirstOrderOutput, firstOrderStates, fopdtSensitivities, simulateFopdt, type CommandHold, type FopdtSensitivities } from './simulate-fopdt.js';
import { meanOf, type StepSignals } from './step-signals.js';
import { twoPointEstimate, type TwoPointEstimate } from './two-point.js';
import { projectGainAndBias } from './variable-projection.js';

/**
 * FOPDT fit of one step: K·e^(−θs)/(τs + 1) from the (relative) input to the output,
 * simulated on the MEASURED input, held or linearly interpolated between samples
 * (`hold`; simulate-fopdt.ts), plus an output bias.
 *
 * The dead time makes the sum of squares non-smooth and multi-modal on sampled data,
 * so the fit runs in three stages:
 * 1. a coarse grid over (θ, τ), on about `FOPDT_SEARCH_DEFAULTS.coarseSamples` samples, in which
 *    K and the bias are solved exactly by linear least squares for each pair (variable projection:
 *    the response is linear in them);
 * 2. Levenberg–Marquardt over τ and θ (θ continuous), K and the bias still solved exactly at
 *    every point (variable projection, variable-projection.ts), from the best `refinedStarts` grid
 *    points and Smith's two-point estimate (two-point.ts), at most `maxRuns` runs from the
 *    best-ranked of those starts; the lowest sum of squares wins, a converged run preferred
 *    (fit-step-model.ts). Its Jacobian is exact (fopdtSensitivities, in Kaufman's projected form),
 *    not finite differences.
 * 3. With the command held, y(θ) has a kink wherever t − θ crosses a sample, and a spurious minimum
 *    can sit just inside a cell between kinks: a fraction of a sample (`kinkProbeSampleFraction`)
 *    beyond each kink around θ is probed (τ + θ kept) and LM runs again from a lower probe (at most
 *    `kinkHops` times).
 */

export interface FopdtFitOptions {
  readonly biasMode: BiasMode;
  /** How the logged command is taken between samples. */
  readonly hold: CommandHold;
  /** Points of the coarse grid over dead time and time constant. */
  readonly deadTimeGridPoints: number;
  readonly timeConstantGridPoints: number;
  /** Grid points refined by Levenberg–Marquardt (besides the two-point start). */
  readonly refinedStarts: number;
}

export const FOPDT_FIT_DEFAULTS: FopdtFitOptions = {
  biasMode: 'fitted',
  hold: 'zeroOrder',
  deadTimeGridPoints: 10,
  timeConstantGridPoints: 7,
  refinedStarts: 1,
};

/**
 * Where the FOPDT fit searches and how it scales its steps. Our choice, set on the synthetic and demo
 * steps of the tests: bounds wide enough for the responses of a steering system's step test, a grid
 * dense enough to rank the starts. Not user options: a fit's result should not depend on tuning them.
 */
export const FOPDT_SEARCH_DEFAULTS = {
  /** Grid dead times run from 0 to min(window / deadTimeWindowDivisor, max(deadTimeFloor_s, … )). */
  deadTimeWindowDivisor: 3,
  /** … deadTimeFloor_s, twoPointDeadTimeFactor · θ of the two-point estimate + twoPointDeadTimeMargin_s). */
  deadTimeFloor_s: 0.4,
  twoPointDeadTimeFactor: 3,
  twoPointDeadTimeMargin_s: 0.1,
  /** Grid time constants (geometric) from max(sample period · timeConstantMinSampleFraction, timeConstantFloor_s) … */
  timeConstantMinSampleFraction: 0.5,
  timeConstantFloor_s: 0.005,
  /** … to max(window · timeConstantMaxWindowFraction, timeConstantSpanRatio · the smallest). */
  timeConstantMaxWindowFraction: 0.5,
  timeConstantSpanRatio: 4,
  /** The coarse grid runs on every stride-th sample, about this many samples (it only ranks starts). */
  coarseSamples: 250,
  /** Levenberg–Marquardt bounds: τ up to timeConstantUpperFactor × the grid's largest, θ up to window · deadTimeUpperWindowFraction. */
  timeConstantUpperFactor: 10,
  deadTimeUpperWindowFraction: 0.5,
  /** Levenberg–Marquardt scales: |K| of the best grid point (at least gainScaleFloor), its τ (at least timeConstantScaleFloor_s), deadTimeScale_s. */
  gainScaleFloor: 1e-6,
  timeConstantScaleFloor_s: 0.02,
  deadTimeScale_s: 0.05,
  /** Most Levenberg–Marquardt runs from the starts. */
  maxRuns: 2,
  /** Runs across a sample kink at most (each: two probes of one simulation, and a run when one is lower). */
  kinkHops: 3,
  /** A kink probe sits this fraction of a sample beyond the kink. */
  kinkProbeSampleFraction: 0.25,
} as const;
const SEARCH = FOPDT_SEARCH_DEFAULTS;

export interface FopdtFit {
  readonly model: FopdtModel;
  readonly fit: StepModelFit;
  /** Smith's two-point estimate, when the response allowed one. */
  readonly twoPoint: TwoPointEstimate | null;
}

interface GridPoint {
  readonly deadTime_s: number;
  readonly timeConstant_s: number;
  readonly gain: number;
  readonly ssr: number;
}

/** Fit K, τ, θ (and the bias) of one step; formulas and method in the file comment. Units: K output/input, τ and θ in s. */
export function fitFopdt(signals: StepSignals, options: FopdtFitOptions = FOPDT_FIT_DEFAULTS): FopdtFit {
  const { time_s, input, output, preStepSamples } = signals;
  const n = time_s.length;
  const fullStates = new Float64Array(n);
  const window_s = time_s[n - 1] - time_s[0];
  const samplePeriod_s = window_s / Math.max(1, n - 1);
  const twoPoint = twoPointEstimate(signals);
  const fixedBias = options.biasMode === 'preStep' ? meanOf(output, 0, Math.max(1, preStepSamples)) : null;

  const deadTimeMax_s = Math.min(
    window_s / SEARCH.deadTimeWindowDivisor,
    Math.max(SEARCH.deadTimeFloor_s, SEARCH.twoPointDeadTimeFactor * Math.max(0, twoPoint?.deadTime_s ?? 0) + SEARCH.twoPointDeadTimeMargin_s),
  );
  const timeConstantMin_s = Math.max(samplePeriod_s * SEARCH.timeConstantMinSampleFraction, SEARCH.timeConstantFloor_s);
  const timeConstantMax_s = Math.max(window_s * SEARCH.timeConstantMaxWindowFraction, SEARCH.timeConstantSpanRatio * timeConstantMin_s);
  // The coarse grid runs on every stride-th sample (about SEARCH.coarseSamples samples): it only ranks starts.
  const stride = Math.max(1, Math.floor(n / SEARCH.coarseSamples));
  const coarseTime = time_s.filter((_, i) => i % stride === 0);
  const coarseInput = input.filter((_, i) => i % stride === 0);
  const coarseOutput = output.filter((_, i) => i % stride === 0);
  const scratch = new Float64Array(coarseTime.length);
  // The lag states depend on the time constant only: computed once per grid time constant.
  const timeConstants_s = Array.from(
    { length: options.timeConstantGridPoints },
    (_, j) => timeConstantMin_s * Math.pow(timeConstantMax_s / timeConstantMin_s, j / (options.timeConstantGridPoints - 1)),
  );
  const statesByTimeConstant = timeConstants_s.map((timeConstant_s) =>
    firstOrderStates({ time_s: coarseTime, input: coarseInput, timeConstant_s, hold: options.hold, states: new Float64Array(coarseTime.length) }),
  );
  const grid: GridPoint[] = [];
  for (let i = 0; i < options.deadTimeGridPoints; i++) {
    const deadTime_s = (deadTimeMax_s * i) / (options.deadTimeGridPoints - 1);
    for (let j = 0; j < options.timeConstantGridPoints; j++) {
      const timeConstant_s = timeConstants_s[j];
      const x = delayedFirstOrderOutput({
        time_s: coarseTime,
        input: coarseInput,
        gain: 1,
        timeConstant_s,
        deadTime_s,
        hold: options.hold,
        states: statesByTimeConstant[j],
        out: scratch,
      });
      const { gain, ssr } = projectGainAndBias(coarseOutput, x, fixedBias);
      grid.push({ deadTime_s, timeConstant_s, gain, ssr });
    }
  }
  grid.sort((a, b) => a.ssr - b.ssr);
  const starts: number[][] = grid.slice(0, options.refinedStarts).map((g) => [g.gain, g.timeConstant_s, g.deadTime_s]);
  if (twoPoint !== null && twoPoint.timeConstant_s > 0) {
    starts.push([twoPoint.gain, twoPoint.timeConstant_s, Math.max(0, twoPoint.deadTime_s)]);
  }
  const gainScale = Math.max(Math.abs(grid[0].gain), SEARCH.gainScaleFloor);
  const deadTimeUpper_s = window_s * SEARCH.deadTimeUpperWindowFraction;
  const columns: FopdtSensitivities = { gain: new Float64Array(n), timeConstant: new Float64Array(n), deadTime: new Float64Array(n) };
  const stateSensitivities = new Float64Array(n);
  const definition: StepModelDefinition = {
    names: ['gain', 'timeConstant_s', 'deadTime_s'],
    simulate: (p) => simulateFopdt({ time_s, input, gain: p[0], timeConstant_s: p[1], deadTime_s: p[2], hold: options.hold, states: fullStates }),
    sensitivities: (p) => {
      fopdtSensitivities({
        time_s,
        input,
        gain: p[0],
        timeConstant_s: p[1],
        deadTime_s: p[2],
        hold: options.hold,
        out: columns,
        states: fullStates,
        stateSensitivities,
      });
      return [columns.gain, columns.timeConstant, columns.deadTime];
    },
    linearInGain: true,
    starts,
    maxRuns: SEARCH.maxRuns,
    scale: [gainScale, Math.max(grid[0].timeConstant_s, SEARCH.timeConstantScaleFloor_s), SEARCH.deadTimeScale_s],
    lower: [-Infinity, 0, 0],
    upper: [Infinity, SEARCH.timeConstantUpperFactor * timeConstantMax_s, deadTimeUpper_s],
  };
  let fit = fitStepModel(signals, definition, options.biasMode);
  if (options.hold === 'zeroOrder') {
    // With the command held, y(θ) has a kink wherever t − θ crosses a sample (θ a whole number of
    // sample periods), and the sum of squares can hold a spurious minimum just inside one cell between
    // kinks. Probe a fraction of a sample (kinkProbeSampleFraction) beyond each of the two kinks around θ, along τ + θ constant (the
    // time to 63 %, the best-determined combination), and run again from a lower probe.
    const projectedSsr = (timeConstant_s: number, deadTime_s: number): number =>
      projectGainAndBias(output, simulateFopdt({ time_s, input, gain: 1, timeConstant_s, deadTime_s, hold: 'zeroOrder', states: fullStates }), fixedBias).ssr;
    const probeOffset_s = samplePeriod_s * SEARCH.kinkProbeSampleFraction;
    for (let hop = 0; hop < SEARCH.kinkHops && fit.stopReason === 'converged'; hop++) {
      const [gain, timeConstant_s, deadTime_s] = fit.parameters;
      const below = Math.floor(deadTime_s / samplePeriod_s) * samplePeriod_s - probeOffset_s;
      const above = Math.ceil(deadTime_s / samplePeriod_s) * samplePeriod_s + probeOffset_s;
      const probes = [below, above]
        .map((theta) => [timeConstant_s + deadTime_s - theta, theta])
        .filter(([tau, theta]) => tau > 0 && theta >= 0 && theta <= deadTimeUpper_s)
        .map(([tau, theta]) => ({ tau, theta, ssr: projectedSsr(tau, theta) }))
        .filter((probe) => probe.ssr < fit.ssr)
        .sort((a, b) => a.ssr - b.ssr);
      if (probes.length === 0) break;
      const next = fitStepModel(signals, { ...definition, starts: [[gain, probes[0].tau, probes[0].theta]], maxRuns: 1 }, options.biasMode);
      if (!(next.stopReason === 'converged' && next.ssr < fit.ssr)) break;
      fit = { ...next, startsGiven: fit.startsGiven + 1, runs: fit.runs + 1 };
    }
  }
  return {
    model: { kind: 'fopdt', gain: fit.parameters[0], timeConstant_s: fit.parameters[1], deadTime_s: fit.parameters[2] },
    fit,
    twoPoint,
  };
}
