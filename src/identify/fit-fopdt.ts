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
 * so the fit runs in two stages:
 * 1. a coarse grid over (θ, τ) in which K and the bias are solved exactly by linear least
 *    squares for each pair (variable projection: the response is linear in them);
 * 2. Levenberg–Marquardt over τ and θ (θ continuous), K and the bias still solved exactly at
 *    every point (variable projection, variable-projection.ts), from the best grid points and
 *    from Smith's two-point estimate (two-point.ts); the lowest converged sum of squares wins.
 *    Its Jacobian is exact (fopdtSensitivities, in Kaufman's projected form), not finite differences.
 * 3. With the command held, y(θ) has a kink wherever t − θ crosses a sample, and a spurious minimum
 *    can sit just inside a cell between kinks: a quarter sample beyond each kink around θ is probed
 *    (τ + θ kept) and LM runs again from a lower probe (at most KINK_HOPS times).
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

/** Runs across a sample kink at most (each: two probes of one simulation, and a run when one is lower). */
const KINK_HOPS = 3;

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

  const deadTimeMax_s = Math.min(window_s / 3, Math.max(0.4, 3 * Math.max(0, twoPoint?.deadTime_s ?? 0) + 0.1));
  const timeConstantMin_s = Math.max(samplePeriod_s / 2, 0.005);
  const timeConstantMax_s = Math.max(window_s / 2, 4 * timeConstantMin_s);
  // The coarse grid runs on every stride-th sample (about 250 samples): it only ranks starts.
  const stride = Math.max(1, Math.floor(n / 250));
  const coarseTime = time_s.filter((_, i) => i % stride === 0);
  const coarseInput = input.filter((_, i) => i % stride === 0);
  const coarseOutput = output.filter((_, i) => i % stride === 0);
  const scratch = new Float64Array(coarseTime.length);
  // The lag states depend on the time constant only: computed once per grid time constant.
  const timeConstants_s = Array.from({ length: options.timeConstantGridPoints }, (_, j) =>
    timeConstantMin_s * Math.pow(timeConstantMax_s / timeConstantMin_s, j / (options.timeConstantGridPoints - 1)),
  );
  const statesByTimeConstant = timeConstants_s.map((timeConstant_s) => firstOrderStates(coarseTime, coarseInput, timeConstant_s, options.hold, new Float64Array(coarseTime.length)));
  const grid: GridPoint[] = [];
  for (let i = 0; i < options.deadTimeGridPoints; i++) {
    const deadTime_s = (deadTimeMax_s * i) / (options.deadTimeGridPoints - 1);
    for (let j = 0; j < options.timeConstantGridPoints; j++) {
      const timeConstant_s = timeConstants_s[j];
      const x = delayedFirstOrderOutput(coarseTime, coarseInput, 1, timeConstant_s, deadTime_s, options.hold, statesByTimeConstant[j], scratch);
      const { gain, ssr } = projectGainAndBias(coarseOutput, x, fixedBias);
      grid.push({ deadTime_s, timeConstant_s, gain, ssr });
    }
  }
  grid.sort((a, b) => a.ssr - b.ssr);
  const starts: number[][] = grid.slice(0, options.refinedStarts).map((g) => [g.gain, g.timeConstant_s, g.deadTime_s]);
  if (twoPoint !== null && twoPoint.timeConstant_s > 0) {
    starts.push([twoPoint.gain, twoPoint.timeConstant_s, Math.max(0, twoPoint.deadTime_s)]);
  }
  const gainScale = Math.max(Math.abs(grid[0].gain), 1e-6);
  const columns: FopdtSensitivities = { gain: new Float64Array(n), timeConstant: new Float64Array(n), deadTime: new Float64Array(n) };
  const stateSensitivities = new Float64Array(n);
  const definition: StepModelDefinition = {
    names: ['gain', 'timeConstant_s', 'deadTime_s'],
    simulate: (p) => simulateFopdt(time_s, input, p[0], p[1], p[2], options.hold, new Float64Array(n), fullStates),
    sensitivities: (p) => {
      fopdtSensitivities(time_s, input, p[0], p[1], p[2], options.hold, columns, fullStates, stateSensitivities);
      return [columns.gain, columns.timeConstant, columns.deadTime];
    },
    linearInGain: true,
    starts,
    maxRuns: 2,
    scale: [gainScale, Math.max(grid[0].timeConstant_s, 0.02), 0.05],
    lower: [-Infinity, 0, 0],
    upper: [Infinity, 10 * timeConstantMax_s, window_s / 2],
  };
  let fit = fitStepModel(signals, definition, options.biasMode);
  if (options.hold === 'zeroOrder') {
    // With the command held, y(θ) has a kink wherever t − θ crosses a sample (θ a whole number of
    // sample periods), and the sum of squares can hold a spurious minimum just inside one cell between
    // kinks. Probe a quarter sample beyond each of the two kinks around θ, along τ + θ constant (the
    // time to 63 %, the best-determined combination), and run again from a lower probe.
    const projectedSsr = (timeConstant_s: number, deadTime_s: number): number =>
      projectGainAndBias(output, simulateFopdt(time_s, input, 1, timeConstant_s, deadTime_s, 'zeroOrder', new Float64Array(n), fullStates), fixedBias).ssr;
    for (let hop = 0; hop < KINK_HOPS && fit.stopReason === 'converged'; hop++) {
      const [gain, timeConstant_s, deadTime_s] = fit.parameters;
      const below = Math.floor(deadTime_s / samplePeriod_s) * samplePeriod_s - samplePeriod_s / 4;
      const above = Math.ceil(deadTime_s / samplePeriod_s) * samplePeriod_s + samplePeriod_s / 4;
      const probes = [below, above]
        .map((theta) => [timeConstant_s + deadTime_s - theta, theta])
        .filter(([tau, theta]) => tau > 0 && theta >= 0 && theta <= window_s / 2)
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
