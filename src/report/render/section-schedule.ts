/** The schedule's own record as tables: breakpoints with gains and proven margins, the worst figures of the dense check and where it fails. */
import { valueAtSpeed, type NumberOverSpeed } from '../../core/by-speed.js';
import type { ScheduleFile } from '../../schedule/schedule-types.js';
import type { ReportData } from '../types.js';
import { escapeHtml, fixedNumber, htmlTable, numberCell, shownNumber, textCell, type Cell } from './html.js';

/** One row per breakpoint: every number as the schedule file holds it (exact in `<data value>`). */
export function breakpointTable(schedule: ScheduleFile): string {
  const { units } = schedule;
  const rows = schedule.breakpoints.map((breakpoint): Cell[] => {
    const m = breakpoint.margins;
    return [
      numberCell(breakpoint.speed_mps, 'speed_mps', fixedNumber(breakpoint.speed_mps, 2)),
      numberCell(breakpoint.kp, 'kp'),
      numberCell(breakpoint.ki, 'ki'),
      numberCell(breakpoint.kd, 'kd'),
      textCell(breakpoint.insertedByRefinement ? 'inserted' : 'planned', 'insertedByRefinement'),
      numberCell(m.lowerGainMargin_dB, 'lowerGainMargin_dB', fixedNumber(m.lowerGainMargin_dB, 2)),
      numberCell(m.upperGainMargin_dB, 'upperGainMargin_dB', fixedNumber(m.upperGainMargin_dB, 2)),
      numberCell(m.phaseMargin_deg, 'phaseMargin_deg', fixedNumber(m.phaseMargin_deg, 1)),
      numberCell(m.delayMargin_s, 'delayMargin_s', shownNumber(m.delayMargin_s, 4)),
      numberCell(m.sensitivityPeak, 'sensitivityPeak', shownNumber(m.sensitivityPeak, 4)),
      numberCell(m.complementarySensitivityPeak, 'complementarySensitivityPeak', shownNumber(m.complementarySensitivityPeak, 4)),
      textCell(m.verdict, 'verdict'),
    ];
  });
  return htmlTable({
    id: 'breakpoints',
    caption: `Breakpoints: gains (kp ${units.kp}; ki ${units.ki}; kd ${units.kd}) and the margins proven at each on the sampled loop`,
    header: ['speed m/s', 'kp', 'ki', 'kd', 'breakpoint', 'lower GM dB', 'upper GM dB', 'PM °', 'delay margin s', 'Ms', 'Mt', 'closed loop'],
    rows,
  });
}

/** The worst figure of each margin over the check grid, with its speed and the limit. */
export function worstTable(schedule: ScheduleFile): string {
  const { worst, thresholds } = schedule.check;
  // A limit that varies with speed is read where the worst figure is.
  const row = (
    name: string,
    field: keyof typeof worst,
    unit: string,
    limitOverSpeed: NumberOverSpeed,
    limitWords: string,
    digits: (value: number) => string,
  ): Cell[] => {
    const value = worst[field];
    const limit = valueAtSpeed(limitOverSpeed, value?.speed_mps ?? schedule.check.range.minimum_mps);
    return [
      textCell(name),
      numberCell(value?.value ?? null, `${field}.value`, value === null ? undefined : digits(value.value)),
      textCell(unit),
      numberCell(value?.speed_mps ?? null, `${field}.speed_mps`, value === null ? undefined : fixedNumber(value.speed_mps, 2)),
      { html: `${escapeHtml(limitWords)} <data value="${String(limit)}">${escapeHtml(shownNumber(limit))}</data>`, field: `${field}.limit` },
    ];
  };
  return htmlTable({
    id: 'worst',
    caption: `Worst figures over the ${schedule.check.gridSize} speeds of the dense check (${fixedNumber(schedule.check.range.minimum_mps, 2)}–${fixedNumber(schedule.check.range.maximum_mps, 2)} m/s) and the limits`,
    header: ['figure', 'worst', 'unit', 'at speed m/s', 'limit'],
    rows: [
      row('lower gain margin (closest to 0 dB)', 'lowerGainMargin_dB', 'dB', thresholds.maximumLowerGainMargin_dB, '≤', (v) => fixedNumber(v, 2)),
      row('upper gain margin (smallest)', 'upperGainMargin_dB', 'dB', thresholds.minimumUpperGainMargin_dB, '≥', (v) => fixedNumber(v, 2)),
      row('phase margin (smallest)', 'phaseMargin_deg', '°', thresholds.minimumPhaseMargin_deg, '≥', (v) => fixedNumber(v, 1)),
      row('delay margin (smallest)', 'delayMargin_s', 's', thresholds.minimumDelayMargin_s, '≥', (v) => shownNumber(v, 4)),
      row('peak sensitivity Ms (largest)', 'sensitivityPeak', '', thresholds.maximumSensitivityPeak, '≤', (v) => shownNumber(v, 4)),
      row('peak complementary sensitivity Mt (largest)', 'complementarySensitivityPeak', '', thresholds.maximumComplementarySensitivityPeak, '≤', (v) =>
        shownNumber(v, 4),
      ),
    ],
  });
}

export function renderScheduleSection(data: ReportData): string {
  const { schedule } = data;
  const check = schedule.check;
  const parts = [
    `<p>The dense check ran the discrete controller on the sampled loop at ${check.gridSize} speeds (breakpoints, midpoints and ${check.gridSpeeds} evenly spaced) on ${escapeHtml(check.model.description)}: ` +
      `<strong>${check.passed ? 'every speed within the limits' : `${check.failedSpeeds} speeds break a limit`}</strong>.</p>`,
    `<div class="table-scroll">${breakpointTable(schedule)}</div>`,
    `<div class="table-scroll">${worstTable(schedule)}</div>`,
  ];
  if (check.insertions.length > 0) {
    parts.push(
      `<h3>Breakpoints inserted by the check</h3><ul>${check.insertions.map((insertion) => `<li>${fixedNumber(insertion.speed_mps, 2)} m/s: ${escapeHtml(insertion.reason)}</li>`).join('')}</ul>`,
    );
  }
  if (check.failures.length > 0) {
    const intervals = data.check?.failingIntervals ?? [];
    const where = intervals.length === 0 ? '' : `<p>Where: <strong>${intervals.map(escapeHtml).join('; ')}</strong>.</p>`;
    parts.push(
      `<h3>Failing speeds</h3><p>${check.failedSpeeds} of ${check.gridSize} speeds break a limit.</p>${where}` +
        `<details><summary>The first ${check.failures.length} failing speeds, as schedule.json lists them</summary><ul>${check.failures
          .map((failure) => `<li>${fixedNumber(failure.speed_mps, 2)} m/s: ${failure.messages.map(escapeHtml).join('; ')}</li>`)
          .join('')}</ul></details>`,
    );
  }
  return parts.join('\n');
}
