/**
 * The optimisation behind MIGO (M-constrained integral gain optimisation; Åström, Panagopoulos &
 * Hägglund 1998, Automatica 34(5); Åström & Hägglund 2006, Advanced PID Control, §7.4): among the PI or
 * PID settings whose loop keeps the sensitivity peaks within bounds, the one with the largest integral
 * gain ki. For a load disturbance entering at the plant input (a steering misalignment, a steady
 * crosswind) the integrated error is 1/ki for a step when the response does not overshoot, so
 * maximising ki removes such disturbances fastest for the robustness asked for.
 *
 * Done here on the loop as the firmware runs it (`FullLoopResponse`: the exact pulse frequency response
 * of the plant under the discrete PID with its derivative filter), in three steps:
 *   1. for a proportional gain kp and derivative gain kd, the largest ki with both peaks within
 *      bounds: doubling from a small ki until a bound breaks, then bisection on log ki (the feasible ki
 *      form an interval [0, ki_max] for the loops here; the result is checked exactly afterwards);
 *   2. a coarse grid over log kp (and log kd for a PID) around the scales of the plant;
 *   3. golden-section search along kp, then along kd, around the best few grid points, then twice more
 *      around the best of them (the problem is not convex).
 * A PID is kept to real zeros, Ti ≥ 4·Td (the series form exists; common practice). The caller confirms the
 * result on the exact analysis (src/verify) and may shrink ki.
 */
import type { PidGains } from '../controller/types.js';
import { goldenSectionMaximum } from '../verify/root-search.js';
import { breaksBoundAt, CORNER_ABOVE_LOWEST, gridLoopCheck, type FullLoopResponse, type SensitivityBounds } from './full-loop.js';

export interface MigoSearchInput {
  readonly response: FullLoopResponse;
  readonly bounds: SensitivityBounds;
  readonly structure: 'PI' | 'PID';
  /** Magnitude scale of kp (e.g. 1/|G| near the expected crossover); the grid spans 10^(−2.5 … 1) around it. */
  readonly proportionalScale: number;
  /** Time scale of Td = kd/kp, s (e.g. 1/expected crossover): kd's grid spans 10^(−2 … 1.5)·proportionalScale·this. */
  readonly derivativeTimeScale_s: number;
  /** Sign of the plant gain: the gains take it. */
  readonly sign: 1 | -1;
  /** A previous optimum (e.g. for a nearby bound): searched around first, the coarse grid only when nothing is found there. */
  readonly start?: PidGains;
}

export interface MigoSearchResult {
  /** The gains; all 0 when no gains keep the bounds. */
  readonly gains: PidGains;
  /** Grid evaluations of the loop. */
  readonly evaluations: number;
}

/** The grids and steps of the MIGO search (our choice; exponents are decades of each gain's scale). */
export const MIGO_SEARCH_DEFAULTS = {
  /** The coarse grid: kp over 10^(−2.5 … 1) of its scale in half decades, kd over 10^(−2 … 1.5) of its scale in quarter decades. */
  kpGrid: { from: -2.5, to: 1, step: 0.5 },
  kdGrid: { from: -2, to: 1.5, step: 0.25 },
  /** The fine grid steps, tried when the coarse one finds nothing (the feasible set can be a narrow ridge in kd). */
  fineKpStep: 0.25,
  fineKdStep: 0.125,
  /** Bisection steps on ki at each grid point. */
  bisectionSteps: 10,
  /** Grid points refined separately before the best is refined further. */
  refinedCandidates: 3,
} as const;
const {
  kpGrid: KP_GRID,
  kdGrid: KD_GRID,
  fineKpStep: FINE_KP_STEP,
  fineKdStep: FINE_KD_STEP,
  bisectionSteps: BISECTION_STEPS,
  refinedCandidates: REFINED_CANDIDATES,
} = MIGO_SEARCH_DEFAULTS;

export function maximiseIntegralGain(input: MigoSearchInput): MigoSearchResult {
  const { response, bounds, structure, sign } = input;
  let evaluations = 0;
  /** The grid point at which the last check broke a bound: asked first (breaksBoundAt), the whole grid swept only when it holds there. */
  let brokenAt = -1;
  const feasible = (kp: number, kd: number, ki: number): boolean => {
    // Real PID zeros (Ti ≥ 4·Td, i.e. ki·kd ≤ kp²/4): the series form exists; without it the optimum can sit
    // in a basin of huge derivative time and tiny kp that changes from one speed to the next.
    if (4 * ki * kd > kp * kp) return false;
    evaluations++;
    const gains = { kp: sign * kp, ki: sign * ki, kd: sign * kd };
    if (brokenAt >= 0 && breaksBoundAt(response, gains, bounds, brokenAt)) return false;
    const check = gridLoopCheck(response, gains, bounds);
    if (check.brokenAt >= 0) brokenAt = check.brokenAt;
    return check.feasible;
  };
  const lowest = response.frequency_radps[0] * CORNER_ABOVE_LOWEST * 1.01;
  let guess = Number.NaN;
  /** Largest ki (magnitude) for kp, kd: 0 when even the smallest ki the grid resolves breaks a bound. */
  const largestKi = (logKp: number, logKd: number | null): number => {
    const kp = Math.exp(logKp);
    const kd = logKd === null ? 0 : Math.exp(logKd);
    // The smallest ki whose PI zero the grid resolves (CORNER_ABOVE_LOWEST above its lowest frequency).
    const floor = kp * lowest;
    let low: number;
    let high: number;
    const start = Number.isFinite(guess) && guess > floor ? guess : floor;
    if (feasible(kp, kd, start)) {
      low = start;
      high = start * 4;
      let steps = 0;
      while (feasible(kp, kd, high)) {
        low = high;
        high *= 4;
        if (++steps > 60) return low;
      }
    } else {
      if (start === floor) return 0;
      high = start;
      low = start / 4;
      while (!feasible(kp, kd, low)) {
        high = low;
        low /= 4;
        if (low <= floor) return feasible(kp, kd, floor) ? floor : 0;
      }
    }
    for (let i = 0; i < BISECTION_STEPS; i++) {
      const middle = Math.sqrt(low * high);
      if (feasible(kp, kd, middle)) low = middle;
      else high = middle;
    }
    return low;
  };
  const logKpScale = Math.log(input.proportionalScale);
  const logKdScale = Math.log(input.proportionalScale * input.derivativeTimeScale_s);
  type Candidate = { logKp: number; logKd: number | null; ki: number };
  const found: Candidate[] = [];
  const consider = (logKp: number, logKd: number | null): void => {
    const ki = largestKi(logKp, logKd);
    if (ki > 0) found.push({ logKp, logKd, ki });
  };
  const scan = (kpStep: number, kdStep: number): void => {
    for (let e = KP_GRID.from; e <= KP_GRID.to + 1e-9; e += kpStep) {
      const logKp = logKpScale + Math.LN10 * e;
      if (structure === 'PI') consider(logKp, null);
      else for (let f = KD_GRID.from; f <= KD_GRID.to + 1e-9; f += kdStep) consider(logKp, logKdScale + Math.LN10 * f);
    }
  };
  if (input.start !== undefined && input.start.kp !== 0) {
    consider(
      Math.log(Math.abs(input.start.kp)),
      structure === 'PID' && input.start.kd !== 0 ? Math.log(Math.abs(input.start.kd)) : structure === 'PID' ? logKdScale : null,
    );
  }
  if (found.length === 0) scan(KP_GRID.step, KD_GRID.step);
  if (found.length === 0) scan(FINE_KP_STEP, FINE_KD_STEP);
  if (found.length === 0) return { gains: { kp: 0, ki: 0, kd: 0 }, evaluations };
  /** Golden-section search along kp, then kd, around a candidate; `rounds` times with halving brackets. */
  const refine = (candidate: Candidate, rounds: number, first: number): Candidate => {
    let best = candidate;
    for (let round = first; round < first + rounds; round++) {
      const kpStep = (Math.LN10 * FINE_KP_STEP) / (round + 1);
      guess = best.ki;
      const alongKp = goldenSectionMaximum((logKp) => largestKi(logKp, best.logKd), best.logKp - kpStep, best.logKp + kpStep, 0.004);
      if (alongKp.value > best.ki) best = { ...best, logKp: alongKp.argument, ki: alongKp.value };
      if (best.logKd !== null) {
        const kdStep = (Math.LN10 * FINE_KD_STEP) / (round + 1);
        const centre = best.logKd;
        guess = best.ki;
        const alongKd = goldenSectionMaximum((logKd) => largestKi(best.logKp, logKd), centre - kdStep, centre + kdStep, 0.004);
        if (alongKd.value > best.ki) best = { ...best, logKd: alongKd.argument, ki: alongKd.value };
      }
    }
    return best;
  };
  // The problem is not convex: refine the best few grid points (at least a grid step apart) once, then the winner further.
  found.sort((p, q) => q.ki - p.ki);
  const leaders: Candidate[] = [];
  for (const candidate of found) {
    if (leaders.length >= REFINED_CANDIDATES) break;
    const apart = leaders.every(
      (leader) => Math.abs(leader.logKp - candidate.logKp) > 1e-9 || Math.abs((leader.logKd ?? 0) - (candidate.logKd ?? 0)) > Math.LN10 * FINE_KD_STEP * 1.5,
    );
    if (apart) leaders.push(candidate);
  }
  let best = leaders.map((leader) => refine(leader, 1, 0)).reduce((p, q) => (q.ki > p.ki ? q : p));
  best = refine(best, 2, 1);
  const kd = best.logKd === null ? 0 : Math.exp(best.logKd);
  return { gains: { kp: sign * Math.exp(best.logKp), ki: sign * best.ki, kd: sign * kd }, evaluations };
}
