/**
 * The pieces of a comparison report shared by the terminal text and the Markdown review:
 * cells of the per-speed table, model drift rows, worst margins, the summary line.
 */
import { describeControllerSettings } from '../controller/defaults.js';
import type { ControllerSettings } from '../controller/types.js';
import { shown, shownPercent, shownSpeed } from './format.js';
import type { ComparedSpeed, GainChange, MarginChange, ScheduleComparison, WorstCaseSide } from './types.js';

export const SPEED_TABLE_HEADER = [
  'speed m/s',
  'breakpoint of',
  'kp old → new',
  'ki old → new',
  'kd old → new',
  'upper GM dB',
  'lower GM dB',
  'PM °',
  'flags',
] as const;

/** Columns right-aligned in the speed table. */
export const SPEED_TABLE_RIGHT = [true, false, false, false, false, false, false, false, false] as const;

export function gainCell(gain: GainChange): string {
  const arrow = `${shown(gain.old)} → ${shown(gain.new)}`;
  if (gain.change === null) return arrow;
  return `${arrow} (${gain.change_pct === null ? (gain.change === 0 ? '±0' : `from 0: ${gain.change > 0 ? '+' : ''}${shown(gain.change)}`) : shownPercent(gain.change_pct)})`;
}

export function marginCell(margin: MarginChange): string {
  if (margin.old === null && margin.new === null) return '—';
  return `${shown(margin.old, 3)} → ${shown(margin.new, 3)}`;
}

function sourceCell(row: ComparedSpeed): string {
  if (row.oldSource === 'breakpoint' && row.newSource === 'breakpoint') return 'both';
  return row.oldSource === 'breakpoint' ? 'old' : 'new';
}

/** Short names of what is flagged at one speed, e.g. 'kp PM'. */
export function flagCell(row: ComparedSpeed): string {
  const names: string[] = [];
  if (row.kp.flagged) names.push('kp');
  if (row.ki.flagged) names.push('ki');
  if (row.kd.flagged) names.push('kd');
  if (row.upperGainMargin_dB.flagged) names.push('upper GM');
  if (row.lowerGainMargin_dB.flagged) names.push('lower GM');
  if (row.phaseMargin_deg.flagged) names.push('PM');
  if (row.oldStable && !row.newStable) names.push('UNSTABLE');
  return names.join(' ');
}

export function speedRow(row: ComparedSpeed): string[] {
  return [
    shownSpeed(row.speed_mps),
    sourceCell(row),
    gainCell(row.kp),
    gainCell(row.ki),
    gainCell(row.kd),
    marginCell(row.upperGainMargin_dB),
    marginCell(row.lowerGainMargin_dB),
    marginCell(row.phaseMargin_deg),
    flagCell(row),
  ];
}

export const DRIFT_HEADER = ['parameter', 'old', 'new', 'change', 'change %'] as const;

export function driftRows(comparison: ScheduleComparison): string[][] {
  if (!comparison.modelDrift.available) return [];
  return comparison.modelDrift.parameters.map((parameter) => [
    parameter.name,
    shown(parameter.old),
    shown(parameter.new),
    shown(parameter.change),
    shownPercent(parameter.change_pct),
  ]);
}

export const WORST_HEADER = ['worst of dense check', 'old', 'new', 'flag'] as const;

export function worstRows(comparison: ScheduleComparison): string[][] {
  const cell = (value: { value: number; speed_mps: number } | null, unit: string) =>
    value === null ? '—' : `${shown(value.value, 3)} ${unit} at ${shownSpeed(value.speed_mps)} m/s`;
  const { worst } = comparison;
  return [
    [
      'upper gain margin',
      cell(worst.upperGainMargin_dB.old, 'dB'),
      cell(worst.upperGainMargin_dB.new, 'dB'),
      worst.upperGainMargin_dB.flagged ? 'flagged' : '',
    ],
    [
      'lower gain margin',
      cell(worst.lowerGainMargin_dB.old, 'dB'),
      cell(worst.lowerGainMargin_dB.new, 'dB'),
      worst.lowerGainMargin_dB.flagged ? 'flagged' : '',
    ],
    ['phase margin', cell(worst.phaseMargin_deg.old, '°'), cell(worst.phaseMargin_deg.new, '°'), worst.phaseMargin_deg.flagged ? 'flagged' : ''],
  ];
}

export const VARIATIONS_HEADER = [
  'speed m/s',
  'old gains: PM ° / upper GM dB / Ms',
  'new gains: PM ° / upper GM dB / Ms',
  'old gains vs limits',
  'new gains vs limits',
] as const;

/** A schedule's worst case at one speed: "41.4 / 10.32 / 1.821", or "unstable". */
function worstCell(side: WorstCaseSide): string {
  if (side.instability !== null) return `${side.instability.verdict}`;
  return [side.worst.phaseMargin_deg, side.worst.upperGainMargin_dB, side.worst.sensitivityPeak]
    .map((figure) => (figure === null ? '—' : shown(figure.value, 3)))
    .join(' / ');
}

/** Rows of the worst case over the new vehicle's variations (empty when not available). */
export function variationsRows(comparison: ScheduleComparison): string[][] {
  const variations = comparison.overVariations;
  if (variations === undefined || !variations.available) return [];
  const verdict = (side: WorstCaseSide): string =>
    side.failures.length === 0 ? 'within' : `FAIL: ${side.failures.length} limit${side.failures.length === 1 ? '' : 's'}`;
  return variations.speeds.map((row) => [shownSpeed(row.speed_mps), worstCell(row.old), worstCell(row.new), verdict(row.old), verdict(row.new)]);
}

/** The heading of that section, or why it is absent (null when it was not asked for). */
export function variationsHeading(comparison: ScheduleComparison): string | null {
  const variations = comparison.overVariations;
  if (variations === undefined) return null;
  if (!variations.available) return `Worst case over the new vehicle's variations: not available — ${variations.reason}.`;
  return (
    `Worst case over the new vehicle's variations (${variations.set.dimensions.length} varied parameters of the ${variations.set.model} model the new schedule records; ` +
    `${variations.acceptance} acceptance${variations.acceptance === 'robust' ? ': the old gains are flagged where they break their limits' : ', reported only'}):`
  );
}

/** Thresholds in words. */
export function thresholdsText(comparison: ScheduleComparison): string {
  const t = comparison.thresholds;
  return `gains ±${t.gainChange_pct} % (from 0: any change above ${t.gainChangeFromZero}); gain margins ${t.gainMarginDrop_dB} dB lost (upper down, lower toward 0 dB); phase margin ${t.phaseMarginDrop_deg}° lost`;
}

/** One line: how many speeds were compared and what was flagged. */
export function summaryLine(comparison: ScheduleComparison): string {
  const compared = comparison.speeds.length;
  const range =
    comparison.commonRange === null
      ? 'no common speeds'
      : `${shownSpeed(comparison.commonRange.minimum_mps)}–${shownSpeed(comparison.commonRange.maximum_mps)} m/s`;
  if (comparison.flags.length === 0) return `Nothing flagged: ${compared} speeds compared (${range}).`;
  const speedsWith = (kinds: readonly string[]) =>
    new Set(comparison.flags.filter((flag) => flag.speed_mps !== null && kinds.includes(flag.kind)).map((flag) => flag.speed_mps)).size;
  const parts: string[] = [];
  const gains = speedsWith(['gainChange']);
  const margins = speedsWith(['upperGainMarginDrop', 'lowerGainMarginCloser', 'phaseMarginDrop', 'stabilityLost']);
  const overSet = speedsWith(['oldGainsFailOverVariations']);
  const settings = comparison.flags.filter((flag) => flag.kind === 'settingChanged').length;
  const whole = comparison.flags.filter((flag) => flag.speed_mps === null && flag.kind !== 'settingChanged' && flag.kind !== 'oldGainsFailOnNewVehicle').length;
  if (comparison.flags.some((flag) => flag.kind === 'oldGainsFailOnNewVehicle')) parts.push('the old gains fail on the new vehicle model');
  if (gains > 0) parts.push(`gains at ${gains} of ${compared} speeds`);
  if (margins > 0) parts.push(`margins at ${margins} of ${compared} speeds`);
  if (overSet > 0) parts.push(`old gains in the worst case over the new variations at ${overSet} of ${compared} speeds`);
  if (settings > 0) parts.push(`${settings} setting${settings === 1 ? '' : 's'}`);
  if (whole > 0) parts.push(`${whole} whole-schedule finding${whole === 1 ? '' : 's'}`);
  const count = comparison.flags.length;
  return `${count} flag${count === 1 ? '' : 's'}: ${parts.join(', ')} (${range})${comparison.gainsComparable ? '' : '; gains NOT comparable one by one'}.`;
}

/** The controller settings the gains assume: one line when both schedules share them, else one per schedule. */
export function controllerLines(old: ControllerSettings, next: ControllerSettings): string[] {
  const [before, after] = [describeControllerSettings(old), describeControllerSettings(next)];
  return before === after
    ? [`controller the gains assume (both): ${after}`]
    : [`controller the old gains assume: ${before}`, `controller the new gains assume: ${after}`];
}
