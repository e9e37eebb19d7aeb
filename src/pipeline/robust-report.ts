/**
 * The terminal report of the worst case over the variations (a schedule's `variations` section, or a fresh
 * robust check of other gains): the set, how it was searched, nominal and worst case side by side at each
 * breakpoint, the worst figures over the grid with the combination behind each, the weakest parameter and
 * the failing speeds.
 */
import type { OverSpeed } from '../core/by-speed.js';
import { fixedOrDash, textTable } from '../core/text-table.js';
import { changeWords, combinationWords, parameterWords } from '../robust/combination-words.js';
import { ROBUST_FIGURES } from '../robust/figures.js';
import { judgeRobust } from '../robust/robust-check.js';
import { ALL_CORNERS_UP_TO_DIMENSIONS } from '../robust/search-points.js';
import { TIME_DOMAIN_FIGURES } from '../robust/time-domain.js';
import type { RobustFigure, RobustMargins, RobustTimeDomainFigure, VariationDimension, VariationSet, WorstTimeDomainFigure } from '../robust/types.js';
import type { WeakestParameter } from '../robust/weakest-parameter.js';
import type { BreakpointMargins } from '../schedule/schedule-types.js';
import type { ScheduleVariations } from '../schedule/schedule-variations.js';
import { breakpointMargins } from '../schedule/breakpoint-margins.js';
import { CRITERION_WORDS } from './schedule-report.js';
import type { AcceptanceThresholds, DenseCheckResult } from '../schedule/types.js';

const DIGITS: Readonly<Record<RobustFigure, number>> = {
  phaseMargin_deg: 1,
  upperGainMargin_dB: 2,
  lowerGainMargin_dB: 2,
  delayMargin_s: 4,
  sensitivityPeak: 3,
  complementarySensitivityPeak: 3,
};

const shownFigure = (figure: RobustFigure, value: number | null): string => {
  const unit = ROBUST_FIGURES.find((definition) => definition.name === figure)?.unit ?? '';
  return value === null ? 'none' : `${value.toFixed(DIGITS[figure])}${unit === '' ? '' : unit === '°' ? '°' : ` ${unit}`}`;
};

/** How the corners were taken, briefly (the schedule records the method in full). */
const cornerWords = (dimensions: number): string =>
  dimensions <= ALL_CORNERS_UP_TO_DIMENSIONS
    ? `all ${2 ** dimensions} corners`
    : `corners by a screening of each parameter and a search over the ${2 ** dimensions} corners`;

/** One side of the box in words: "mass −10.0 % to +10.0 % (plan ±10 %)". */
export function dimensionWords(dimension: VariationDimension): string {
  const end = (value: number): string => changeWords(dimension.parameter, value)?.replace(`${parameterWords(dimension.parameter)} `, '') ?? 'nominal';
  return `${parameterWords(dimension.parameter)} ${end(dimension.minimum)} to ${end(dimension.maximum)} (${dimension.source})`;
}

/** The set, one line a dimension, and what the model could not take. */
export function formatSet(set: VariationSet): string[] {
  const model = set.model === 'single-track' ? 'the joint single-track model' : 'the interpolated lumped models';
  const lines = [`  set: changes around ${model}${set.dimensions.length === 0 ? ' — none (every range is zero): the worst case is the nominal vehicle' : ':'}`];
  for (const dimension of set.dimensions) lines.push(`    ${dimensionWords(dimension)}`);
  for (const skipped of set.notApplied) lines.push(`    not applied: ${skipped.field} — ${skipped.reason}`);
  return lines;
}

/** The weakest parameter in one sentence. */
export function weakestWords(weakest: WeakestParameter): string {
  const name = parameterWords(weakest.parameter);
  if (weakest.figure === 'stability') {
    return `${name} — at ${weakest.speed_mps.toFixed(2)} m/s the set holds an unstable loop (${combinationWords(weakest.combination)}); with the ${name} at nominal it is ${weakest.restoresStability === true ? 'stable' : 'still not stable'}`;
  }
  const words = ROBUST_FIGURES.find((definition) => definition.name === weakest.figure)?.words ?? weakest.figure;
  return (
    `${name} — at ${weakest.speed_mps.toFixed(2)} m/s the ${words} is ${shownFigure(weakest.figure, weakest.worst)} in the worst case (${combinationWords(weakest.combination)}); ` +
    `with the ${name} alone at nominal it is ${weakest.withParameterNominal === null ? 'not stable or without that figure' : shownFigure(weakest.figure, weakest.withParameterNominal)}`
  );
}

/** A breakpoint's robust figures (from a schedule's section) with its nominal margins, as the judging takes them. */
function robustPointOf(breakpoint: ScheduleVariations['breakpoints'][number], nominal: BreakpointMargins): RobustMargins {
  return {
    speed_mps: breakpoint.speed_mps,
    gains: { kp: 0, ki: 0, kd: 0 },
    nominal,
    instability: breakpoint.instability,
    worst: breakpoint.worst,
    evaluations: 0,
  };
}

/** Nominal → worst case at each breakpoint, the limits the worst case breaks, and the weakest parameter there. */
function breakpointTable(variations: ScheduleVariations, nominal: readonly BreakpointMargins[], thresholds: OverSpeed<AcceptanceThresholds>): string[] {
  const pair = (figure: RobustFigure, margins: BreakpointMargins, worst: ScheduleVariations['breakpoints'][number]): string =>
    `${fixedOrDash(margins[figure], DIGITS[figure])} → ${worst.instability !== null ? 'unstable' : fixedOrDash(worst.worst[figure]?.value ?? null, DIGITS[figure])}`;
  const rows = [['speed m/s', 'PM °', 'upper GM dB', 'lower GM dB', 'delay margin s', 'Ms', 'Mt', 'worst case vs limits', 'weakest parameter']];
  variations.breakpoints.forEach((breakpoint, k) => {
    const margins = nominal[k];
    const failures = judgeRobust(robustPointOf(breakpoint, margins), thresholds);
    rows.push([
      breakpoint.speed_mps.toFixed(2),
      pair('phaseMargin_deg', margins, breakpoint),
      pair('upperGainMargin_dB', margins, breakpoint),
      pair('lowerGainMargin_dB', margins, breakpoint),
      pair('delayMargin_s', margins, breakpoint),
      pair('sensitivityPeak', margins, breakpoint),
      pair('complementarySensitivityPeak', margins, breakpoint),
      failures.length === 0 ? 'pass' : `FAIL: ${failures.map((failure) => CRITERION_WORDS[failure.criterion]).join(', ')}`,
      breakpoint.weakest === null ? '—' : parameterWords(breakpoint.weakest.parameter),
    ]);
  });
  return textTable(rows, [true, true, true, true, true, true, true, false, false]).map((line) => `  ${line}`);
}

const TIME_DOMAIN_HEADINGS: Readonly<Record<RobustTimeDomainFigure, string>> = {
  overshoot_pct: 'overshoot %',
  settlingTime_s: 'settle s',
  misalignmentRecoveryTime_s: 'misalign. s',
  lateralForceRecoveryTime_s: 'force s',
  laneChangeError_m: 'lane change m',
  curveEntryError_m: 'curve m',
  limitedStepOvershoot_pct: 'limited step %',
  limitedStepSettlingTime_s: 'limited settle s',
};

/** The worst time-domain figures at each breakpoint (only the figures the loop has), or nothing when none were simulated. */
function timeDomainTable(variations: ScheduleVariations): string[] {
  const simulated = variations.breakpoints.filter((breakpoint) => breakpoint.timeDomain !== null);
  if (simulated.length === 0) return [];
  const figures = TIME_DOMAIN_FIGURES.filter((definition) => simulated.some((breakpoint) => breakpoint.timeDomain?.worst[definition.name] !== null));
  const cell = (worst: WorstTimeDomainFigure | null): string => (worst === null ? '—' : worst.value === null ? 'not settled' : worst.value.toFixed(2));
  const rows = [['speed m/s', ...figures.map((definition) => TIME_DOMAIN_HEADINGS[definition.name]), 'vehicles', 'worst case vs limits']];
  for (const breakpoint of variations.breakpoints) {
    const timeDomain = breakpoint.timeDomain;
    rows.push([
      breakpoint.speed_mps.toFixed(2),
      ...figures.map((definition) => (timeDomain === null ? '—' : cell(timeDomain.worst[definition.name]))),
      timeDomain === null ? '—' : String(timeDomain.vehicles),
      timeDomain === null
        ? 'not simulated (unstable in the set)'
        : timeDomain.failures.length === 0
          ? 'pass'
          : `FAIL: ${timeDomain.failures.length} limit${timeDomain.failures.length === 1 ? '' : 's'}`,
    ]);
  }
  const failures = variations.breakpoints.flatMap((breakpoint) =>
    (breakpoint.timeDomain?.failures ?? []).map((message) => `    ${breakpoint.speed_mps.toFixed(2)} m/s: ${message}`),
  );
  return [
    '',
    '  time domain, worst case over the set at each breakpoint (its own gains, set-point weights and feed-forward; simulated on the nominal vehicle, the corners and the combinations behind the worst margins):',
    ...textTable(rows, [true, ...figures.map(() => true), true, false]).map((line) => `  ${line}`),
    ...failures,
  ];
}

/** The nominal margins a dense check found at each breakpoint speed (they are in its grid), as a schedule records them. */
export function nominalAtBreakpoints(check: DenseCheckResult, breakpointSpeeds: readonly number[]): BreakpointMargins[] {
  return breakpointSpeeds.map((speed_mps) => {
    const point = check.points.find((candidate) => candidate.speed_mps === speed_mps);
    if (point === undefined) throw new Error(`internal: breakpoint ${speed_mps} m/s missing from the check grid`);
    return breakpointMargins(point.margins);
  });
}

/** The whole report of a `variations` section; `nominal` holds the nominal margins at its breakpoints (same order). */
export function formatVariations(
  variations: ScheduleVariations,
  nominal: readonly BreakpointMargins[],
  thresholds: OverSpeed<AcceptanceThresholds>,
  title = 'Worst case over the variations',
): string {
  const verdict = variations.passed
    ? 'PASSED'
    : `FAILED at ${variations.failedSpeeds} speeds${variations.unstableSpeeds > 0 ? ` (${variations.unstableSpeeds} with an unstable loop in the set)` : ''}`;
  const acceptance =
    variations.acceptance === 'robust'
      ? 'robust acceptance: a schedule passes only if its worst case does'
      : 'nominal acceptance: reported beside the nominal check, not required';
  const lines = [
    `${title}, ${variations.gridSize} speeds (${acceptance}): ${verdict}`,
    ...formatSet(variations.set),
    `  search at each speed: ${cornerWords(variations.set.dimensions.length)}, ${variations.search.samples} seeded samples (seed ${variations.search.seed}), compass search from the worst points (at most ${variations.search.localSearchEvaluations} analyses); ${variations.loopAnalyses.toLocaleString('en-US')} loop analyses in all`,
    '',
    '  nominal → worst case over the set, at each breakpoint:',
    ...breakpointTable(variations, nominal, thresholds),
    ...timeDomainTable(variations),
    '',
    '  worst over the grid:',
  ];
  for (const definition of ROBUST_FIGURES) {
    const worst = variations.worst[definition.name];
    lines.push(
      worst === null
        ? `    ${definition.words}: none on the grid`
        : `    ${definition.words}: ${shownFigure(definition.name, worst.value)} at ${worst.speed_mps.toFixed(2)} m/s with ${combinationWords(worst.combination)}`,
    );
  }
  if (variations.weakest !== null) lines.push('', `  weakest parameter: ${weakestWords(variations.weakest)}`);
  if (variations.failures.length > 0) {
    lines.push('', '  failing speeds of the worst case (first 10):');
    for (const failure of variations.failures.slice(0, 10)) lines.push(`    ${failure.speed_mps.toFixed(2)} m/s: ${failure.messages.join('; ')}`);
  }
  return `${lines.join('\n')}\n`;
}
