/**
 * The robust check: at each grid speed, the worst case of the scheduled gains over the variation set
 * (worst-case.ts), judged on the acceptance limits of the dense check — a set holding a loop that is not
 * stable fails on that alone, naming the combination; otherwise every worst figure is judged as a loop's
 * margins are (judgeMargins), and each message names the combination that gives it.
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import type { PidGains } from '../controller/types.js';
import { judgeMargins } from '../schedule/dense-check.js';
import type { AcceptanceThresholds, CheckFailure, GainsAtSpeed, ProgressCallback } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import { combinationWords } from './combination-words.js';
import { ROBUST_FIGURES, badness } from './figures.js';
import type { AnalyseOverSet, RobustCheckPoint, RobustCheckResult, RobustFigure, RobustMargins, RobustWorstValue } from './types.js';

/** Every acceptance limit the worst case over the set breaks at one speed, with the combination in each message. */
export function judgeRobust(point: RobustMargins, thresholds: OverSpeed<AcceptanceThresholds>): CheckFailure[] {
  if (point.instability !== null) {
    const { verdict, combination } = point.instability;
    return [{ criterion: 'stability', value: null, limit: null, message: `closed loop ${verdict} with ${combinationWords(combination)}` }];
  }
  const value = (figure: RobustFigure): number | null => point.worst[figure]?.value ?? null;
  const margins = {
    stable: true,
    verdict: 'stable',
    lowerGainMargin_dB: value('lowerGainMargin_dB'),
    upperGainMargin_dB: value('upperGainMargin_dB'),
    phaseMargin_deg: value('phaseMargin_deg'),
    delayMargin_s: value('delayMargin_s'),
    sensitivityPeak: value('sensitivityPeak') ?? point.nominal.sensitivityPeak ?? Infinity,
    complementarySensitivityPeak: value('complementarySensitivityPeak') ?? point.nominal.complementarySensitivityPeak ?? Infinity,
  } as unknown as LoopMargins;
  const figureOf: Partial<Record<CheckFailure['criterion'], RobustFigure>> = {
    lowerGainMargin: 'lowerGainMargin_dB',
    upperGainMargin: 'upperGainMargin_dB',
    phaseMargin: 'phaseMargin_deg',
    delayMargin: 'delayMargin_s',
    sensitivityPeak: 'sensitivityPeak',
    complementarySensitivityPeak: 'complementarySensitivityPeak',
  };
  return judgeMargins(margins, atSpeed(thresholds, point.speed_mps)).map((failure) => {
    const figure = figureOf[failure.criterion];
    const worst = figure === undefined ? null : point.worst[figure];
    return worst === null ? failure : { ...failure, message: `${failure.message} (worst case: ${combinationWords(worst.combination)})` };
  });
}

/** Worst value of each figure over the points (first speed wins ties); null where no point has the figure. */
export function robustWorstOverGrid(points: readonly RobustMargins[]): Record<RobustFigure, RobustWorstValue | null> {
  const worst = Object.fromEntries(ROBUST_FIGURES.map((definition) => [definition.name, null])) as Record<RobustFigure, RobustWorstValue | null>;
  for (const point of points) {
    for (const definition of ROBUST_FIGURES) {
      const figure = point.worst[definition.name];
      if (figure === null) continue;
      const current = worst[definition.name];
      if (current === null || badness(figure.value, definition) > badness(current.value, definition)) {
        worst[definition.name] = { value: figure.value, speed_mps: point.speed_mps, combination: figure.combination };
      }
    }
  }
  return worst;
}

/** The check's result from its judged points (in grid order). */
export function robustCheckResult(points: readonly RobustCheckPoint[]): RobustCheckResult {
  const failedCount = points.reduce((count, point) => count + (point.failures.length > 0 ? 1 : 0), 0);
  return {
    passed: failedCount === 0,
    points,
    failedCount,
    unstableCount: points.reduce((count, point) => count + (point.instability === null ? 0 : 1), 0),
    worst: robustWorstOverGrid(points),
    evaluations: points.reduce((total, point) => total + point.evaluations, 0),
  };
}

export interface RobustCheckInput {
  readonly grid: ArrayLike<number>;
  readonly gainsAt: GainsAtSpeed;
  readonly analyse: AnalyseOverSet;
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly onProgress?: ProgressCallback;
}

/** One judged speed of the robust check. */
export function robustCheckPoint(speed_mps: number, gains: PidGains, analyse: AnalyseOverSet, thresholds: OverSpeed<AcceptanceThresholds>): RobustCheckPoint {
  const margins = analyse(speed_mps, gains);
  return { ...margins, failures: judgeRobust(margins, thresholds) };
}

/** The robust check on the main thread: every grid speed in order (progress about every 5 % of the grid). */
export function robustCheck(input: RobustCheckInput): RobustCheckResult {
  const total = input.grid.length;
  const every = Math.max(1, Math.floor(total / 20));
  const points: RobustCheckPoint[] = [];
  for (let i = 0; i < total; i++) {
    const speed_mps = input.grid[i];
    points.push(robustCheckPoint(speed_mps, input.gainsAt(speed_mps), input.analyse, input.thresholds));
    if (input.onProgress !== undefined && ((i + 1) % every === 0 || i + 1 === total))
      input.onProgress({ stage: 'check', done: i + 1, total, note: 'over the variations' });
  }
  return robustCheckResult(points);
}
