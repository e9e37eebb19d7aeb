/** The comparison as Markdown for a change review: title, summary, per-speed table, worst margins, model drift, settings and a flag list. */
import { SAFETY_EPILOGUE } from '../core/safety.js';
import { shownSpeed } from './format.js';
import {
  DRIFT_HEADER,
  SPEED_TABLE_HEADER,
  VARIATIONS_HEADER,
  WORST_HEADER,
  controllerLines,
  driftRows,
  speedRow,
  summaryLine,
  thresholdsText,
  variationsHeading,
  variationsRows,
  worstRows,
} from './comparison-words.js';
import { oldGainsLead, oldGainsModelWords } from './old-gains-words.js';
import type { ScheduleComparison } from './types.js';

const escapeCell = (cell: string): string => cell.replace(/\|/g, '\\|');

function markdownTable(header: readonly string[], rows: readonly (readonly string[])[]): string[] {
  return [
    `| ${header.map(escapeCell).join(' | ')} |`,
    `|${header.map(() => '---').join('|')}|`,
    ...rows.map((row) => `| ${row.map(escapeCell).join(' | ')} |`),
  ];
}

const modelNote = (comparison: ScheduleComparison): string => {
  const words = oldGainsModelWords(comparison.oldGainsOnNewVehicle);
  return words === null ? '' : ` (${words}.)`;
};

/** Markdown report of a comparison; `oldName`/`newName` are how the user named the files. */
export function comparisonMarkdown(comparison: ScheduleComparison, oldName: string, newName: string): string {
  const { old, new: next } = comparison;
  const lines: string[] = [
    `## Gain schedule change: \`${oldName}\` → \`${newName}\``,
    '',
    `**${oldGainsLead(comparison.oldGainsOnNewVehicle)}**${modelNote(comparison)}`,
    '',
    `**${summaryLine(comparison)}**`,
    '',
    `- old: ${old.vehicle}, ${old.loopKind} loop, ${old.breakpoints} breakpoints, check ${old.status}, checksum \`${old.checksum.slice(0, 16)}…\``,
    `- new: ${next.vehicle}, ${next.loopKind} loop, ${next.breakpoints} breakpoints, check ${next.status}, checksum \`${next.checksum.slice(0, 16)}…\``,
    `- gain units (new): kp ${next.units.kp}, ki ${next.units.ki}, kd ${next.units.kd}`,
    ...controllerLines(old.controller, next.controller).map((line) => `- ${line}`),
    `- flagged when: ${thresholdsText(comparison)}`,
    '',
  ];
  if (!comparison.gainsComparable)
    lines.push('> The gains are **not comparable one by one**: a loop or controller setting changed (see Settings). Margins are still compared.', '');
  if (comparison.speeds.length > 0) {
    lines.push('### Gains and margins', '', ...markdownTable(SPEED_TABLE_HEADER, comparison.speeds.map(speedRow)), '');
    if (!comparison.sameBreakpoints)
      lines.push(
        '"breakpoint of" names whose table row a speed is; the other schedule is read through its own lookup and its margins are interpolated linearly between its breakpoints.',
        '',
      );
  }
  const { old_mps, new_mps } = comparison.notCompared;
  if (old_mps.length + new_mps.length > 0)
    lines.push(
      `Not compared (outside the common range): old ${old_mps.map(shownSpeed).join(', ') || 'none'}; new ${new_mps.map(shownSpeed).join(', ') || 'none'} m/s.`,
      '',
    );
  lines.push('### Worst margins of each dense check', '', ...markdownTable(WORST_HEADER, worstRows(comparison)), '');
  lines.push('### Model drift', '');
  if (comparison.modelDrift.available) lines.push(...markdownTable(DRIFT_HEADER, driftRows(comparison)), '');
  else lines.push(`Not available: ${comparison.modelDrift.reason}.`, '');
  const variationsTitle = variationsHeading(comparison);
  if (variationsTitle !== null) {
    lines.push("### Worst case over the new vehicle's variations", '', variationsTitle, '');
    const rows = variationsRows(comparison);
    if (rows.length > 0) lines.push(...markdownTable(VARIATIONS_HEADER, rows), '');
  }
  if (comparison.settingChanges.length > 0) {
    lines.push(
      '### Settings',
      '',
      ...comparison.settingChanges.map(
        (change) =>
          `- \`${change.setting}\`: ${String(change.old ?? 'none')} → ${String(change.new ?? 'none')}${change.breaksGainComparison ? ' (gains not comparable)' : ''}`,
      ),
      '',
    );
  }
  lines.push('### Flags', '');
  if (comparison.flags.length === 0) lines.push('None.');
  else lines.push(...comparison.flags.map((flag) => `- [ ] ${flag.message}`));
  lines.push('', `> A comparison is not a verification: the new schedule's own dense check decides. ${SAFETY_EPILOGUE}`);
  return `${lines.join('\n')}\n`;
}
