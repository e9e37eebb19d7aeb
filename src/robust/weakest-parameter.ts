/**
 * Where the schedule is weakest and against what: at a speed, the figure nearest its acceptance limit (or past
 * it furthest) over the set — relative to the limit, so degrees and decibels compare — and, of the parameters
 * changed in the combination behind it, the one whose return to its nominal value alone recovers most of that
 * figure. A set holding an unstable loop is weakest at that loop: the parameter whose return to nominal
 * restores stability, or else lowers the largest closed-loop pole most.
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import type { LoopMargins } from '../verify/types.js';
import { ROBUST_FIGURES, badness, figureValue } from './figures.js';
import type { RobustFigure, RobustMargins, VariationSet, VariedParameter, WeakestParameter } from './types.js';

export type { WeakestParameter } from './types.js';

/** How far a worst figure lies inside its limit, relative to the limit (negative: past it); null for a figure without a limit (none today). */
export function slackToLimit(figure: RobustFigure, value: number, thresholds: AcceptanceThresholds): number | null {
  switch (figure) {
    case 'phaseMargin_deg':
      return (value - thresholds.minimumPhaseMargin_deg) / Math.max(thresholds.minimumPhaseMargin_deg, 1);
    case 'upperGainMargin_dB':
      return (value - thresholds.minimumUpperGainMargin_dB) / Math.max(thresholds.minimumUpperGainMargin_dB, 1);
    case 'lowerGainMargin_dB':
      return (thresholds.maximumLowerGainMargin_dB - value) / Math.max(-thresholds.maximumLowerGainMargin_dB, 1);
    case 'delayMargin_s':
      return (value - thresholds.minimumDelayMargin_s) / Math.max(thresholds.minimumDelayMargin_s, 1e-3);
    case 'sensitivityPeak':
      return (thresholds.maximumSensitivityPeak - value) / Math.max(thresholds.maximumSensitivityPeak - 1, 0.1);
    case 'complementarySensitivityPeak':
      return (thresholds.maximumComplementarySensitivityPeak - value) / Math.max(thresholds.maximumComplementarySensitivityPeak - 1, 0.1);
  }
}

/** The figure of a robust point nearest its limit: 'stability' (slack −Infinity) when the set holds an unstable loop; null when no figure has a limit. */
export function tightestFigure(
  point: RobustMargins,
  thresholdsOverSpeed: OverSpeed<AcceptanceThresholds>,
): { figure: RobustFigure | 'stability'; slack: number } | null {
  if (point.instability !== null) return { figure: 'stability', slack: -Infinity };
  const thresholds = atSpeed(thresholdsOverSpeed, point.speed_mps);
  let tightest: { figure: RobustFigure; slack: number } | null = null;
  for (const definition of ROBUST_FIGURES) {
    const worst = point.worst[definition.name];
    const slack = worst === null ? null : slackToLimit(definition.name, worst.value, thresholds);
    if (slack !== null && (tightest === null || slack < tightest.slack)) tightest = { figure: definition.name, slack };
  }
  return tightest;
}

/**
 * The weakest parameter at a robust point (see the module comment). `analyse` analyses the loop at this
 * speed with the set's changes (one value per dimension, in order). Null when no parameter is changed in
 * the combination behind the tightest figure (the nominal vehicle is the worst case) or no figure has a limit.
 */
export function weakestParameter(
  point: RobustMargins,
  thresholds: OverSpeed<AcceptanceThresholds>,
  set: VariationSet,
  analyse: (values: readonly number[]) => LoopMargins,
): WeakestParameter | null {
  const tightest = tightestFigure(point, thresholds);
  if (tightest === null) return null;
  const combination = tightest.figure === 'stability' ? point.instability!.combination : point.worst[tightest.figure]!.combination;
  const values = set.dimensions.map((dimension) => combination[dimension.parameter] ?? (dimension.change === 'scale' ? 1 : 0));
  const definition = ROBUST_FIGURES.find((candidate) => candidate.name === tightest.figure);
  let best: { parameter: VariedParameter; score: number; value: number | null; stable: boolean } | null = null;
  set.dimensions.forEach((dimension, i) => {
    const nominal = dimension.change === 'scale' ? 1 : 0;
    if (values[i] === nominal) return;
    const trial = [...values];
    trial[i] = nominal;
    const margins = analyse(trial);
    const stable = margins.verdict === 'stable';
    // Score: how much better the figure gets (stability: restored first, then the largest pole's drop).
    let score: number;
    let value: number | null = null;
    if (definition === undefined) {
      const pole = margins.analysis?.sampledDataLargestPoleMagnitude ?? null;
      const before = point.instability?.largestPoleMagnitude ?? null;
      score = stable ? Infinity : pole !== null && before !== null ? before - pole : -Infinity;
    } else {
      value = stable ? figureValue(margins, definition.name) : null;
      score = stable ? badness(point.worst[definition.name]!.value, definition) - badness(value, definition) : -Infinity;
    }
    if (best === null || score > best.score) best = { parameter: dimension.parameter, score, value, stable };
  });
  if (best === null) return null;
  const chosen: { parameter: VariedParameter; value: number | null; stable: boolean } = best;
  return {
    speed_mps: point.speed_mps,
    figure: tightest.figure,
    parameter: chosen.parameter,
    worst: definition === undefined ? null : point.worst[definition.name]!.value,
    withParameterNominal: chosen.value,
    restoresStability: definition === undefined ? chosen.stable : null,
    combination,
  };
}
