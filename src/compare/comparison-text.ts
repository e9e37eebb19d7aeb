/** The comparison as terminal text: header, per-speed table, worst margins, model drift, settings, flags, summary line. */
import { SAFETY_EPILOGUE } from '../core/safety.js';
import { alignedTable, shownSpeed } from './format.js';
import {
  controllerLines,
  DRIFT_HEADER,
  SPEED_TABLE_HEADER,
  SPEED_TABLE_RIGHT,
  WORST_HEADER,
  driftRows,
  speedRow,
  summaryLine,
  thresholdsText,
  VARIATIONS_HEADER,
  variationsHeading,
  variationsRows,
  worstRows,
} from './comparison-words.js';
import { oldGainsLead, oldGainsModelWords } from './old-gains-words.js';
import type { ScheduleComparison } from './types.js';

/** Terminal report of a comparison; `oldName`/`newName` are how the user named the files. Ends with the summary line. */
export function comparisonText(comparison: ScheduleComparison, oldName: string, newName: string): string {
  const { old, new: next } = comparison;
  const lines: string[] = [
    `Schedule comparison: ${oldName} → ${newName}`,
    oldGainsLead(comparison.oldGainsOnNewVehicle),
    ...(oldGainsModelWords(comparison.oldGainsOnNewVehicle) === null ? [] : [`  (${oldGainsModelWords(comparison.oldGainsOnNewVehicle)})`]),
    `  old: ${old.vehicle}, ${old.loopKind} loop, ${old.breakpoints} breakpoints, check ${old.status}, checksum ${old.checksum.slice(0, 16)}…`,
    `  new: ${next.vehicle}, ${next.loopKind} loop, ${next.breakpoints} breakpoints, check ${next.status}, checksum ${next.checksum.slice(0, 16)}…`,
    `  gain units (new): kp ${next.units.kp}, ki ${next.units.ki}, kd ${next.units.kd}`,
    ...controllerLines(old.controller, next.controller).map((line) => `  ${line}`),
    `  flagged when: ${thresholdsText(comparison)}`,
    '',
  ];
  if (!comparison.gainsComparable) {
    lines.push('The gains are NOT comparable one by one (a loop or controller setting changed, see below); margins are still compared.', '');
  }
  if (comparison.speeds.length > 0) {
    lines.push(
      comparison.sameBreakpoints
        ? 'Per breakpoint (same breakpoints in both):'
        : 'Per speed (union of both breakpoints in the common range; "breakpoint of" says whose table row it is — the other schedule is read through its own lookup, its margins interpolated linearly):',
    );
    lines.push(...alignedTable([[...SPEED_TABLE_HEADER], ...comparison.speeds.map(speedRow)], SPEED_TABLE_RIGHT).map((line) => `  ${line}`), '');
  }
  const { old_mps, new_mps } = comparison.notCompared;
  if (old_mps.length + new_mps.length > 0) {
    lines.push(
      `Not compared (outside the common range): old ${old_mps.map(shownSpeed).join(', ') || 'none'}; new ${new_mps.map(shownSpeed).join(', ') || 'none'} m/s`,
      '',
    );
  }
  lines.push(
    'Worst margins of each dense check:',
    ...alignedTable([[...WORST_HEADER], ...worstRows(comparison)], [false, false, false, false]).map((line) => `  ${line}`),
    '',
  );
  if (comparison.modelDrift.available) {
    lines.push(
      'Model drift (single-track fit behind each schedule):',
      ...alignedTable([[...DRIFT_HEADER], ...driftRows(comparison)], [false, true, true, true, true]).map((line) => `  ${line}`),
      '',
    );
  } else {
    lines.push(`Model drift: not available — ${comparison.modelDrift.reason}.`, '');
  }
  const variationsTitle = variationsHeading(comparison);
  if (variationsTitle !== null) {
    lines.push(variationsTitle);
    const rows = variationsRows(comparison);
    if (rows.length > 0) lines.push(...alignedTable([[...VARIATIONS_HEADER], ...rows], [true, false, false, false, false]).map((line) => `  ${line}`));
    lines.push('');
  }
  if (comparison.settingChanges.length > 0) {
    lines.push(
      'Settings changed:',
      ...comparison.settingChanges.map(
        (change) =>
          `  ${change.setting}: ${String(change.old ?? 'none')} → ${String(change.new ?? 'none')}${change.breaksGainComparison ? ' (gains not comparable)' : ''}`,
      ),
      '',
    );
  }
  if (comparison.flags.length > 0) {
    lines.push('Flags:', ...comparison.flags.map((flag) => `  - ${flag.message}`), '');
  }
  lines.push(`A comparison is not a verification: the new schedule's own dense check decides. ${SAFETY_EPILOGUE}`, '', summaryLine(comparison));
  return `${lines.join('\n')}\n`;
}
