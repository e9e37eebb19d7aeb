/**
 * The human-readable form of a log inspection: a header block, a channel table,
 * a step table (SI with degrees beside angles), rejections with reasons, and
 * warnings. Fixed-width columns so that logs line up when several are shown.
 */
import { radiansToDegrees } from '../core/units.js';
import { textTable as table } from '../core/text-table.js';
import type { LogInspection } from './inspect.js';
import { quoted } from '../core/quote.js';

const dash = '—';
const fixed = (value: number | null, digits: number): string => (value === null || !Number.isFinite(value) ? dash : value.toFixed(digits));
const signed = (value: number, digits: number): string => `${value >= 0 ? '+' : ''}${value.toFixed(digits)}`;

/** Text report of one inspected log (units in headings; angles in rad with degrees beside them). */
export function formatInspection(inspection: LogInspection): string {
  const lines: string[] = [];
  const segments = inspection.segmentCount === 1 ? '1 segment' : `${inspection.segmentCount} segments`;
  lines.push(inspection.file);
  lines.push(
    `  ${inspection.duration_s.toFixed(2)} s, ${inspection.sampleRate_Hz.toFixed(1)} Hz (median period ${inspection.samplePeriod_s.toPrecision(3)} s), ${inspection.rowCount} rows, ${segments}`,
  );
  for (const split of inspection.splits) lines.push(`  split at line ${split.line}: time gap ${split.gap_s.toFixed(3)} s`);
  const dropped = Object.entries(inspection.droppedRows);
  if (dropped.length > 0) lines.push(`  lines skipped: ${dropped.map(([reason, count]) => `${count} ${reason}`).join(', ')}`);

  lines.push('', '  channels');
  const channelRows = [['channel', 'from column', 'recorded in', 'min', 'max', 'unit']];
  for (const channel of inspection.channels) {
    const digits = channel.channel === 'time_s' ? 3 : 4;
    channelRows.push([
      channel.channel,
      `${channel.columnNumber} ${quoted(channel.header)}`,
      channel.recordedUnit,
      fixed(channel.min, digits),
      fixed(channel.max, digits),
      channel.unit,
    ]);
  }
  lines.push(...table(channelRows, [false, false, false, true, true, false]).map((line) => `    ${line}`));

  lines.push('', `  steps: ${inspection.steps.length} found, ${inspection.rejected.length} rejected`);
  if (inspection.steps.length > 0) {
    const stepRows = [['#', 'onset s', 'speed m/s', 'amplitude rad', 'deg', 'direction', 'yaw gain 1/s', 'response s', 'peak s', 'overshoot %']];
    for (const step of inspection.steps) {
      stepRows.push([
        String(step.stepIndex),
        step.onset_s.toFixed(2),
        step.speed_mps.toFixed(2),
        signed(step.amplitude_rad, 4),
        signed(radiansToDegrees(step.amplitude_rad), 2),
        step.direction,
        fixed(step.metrics.steadyYawGain_perS, 3),
        fixed(step.metrics.responseTime_s, 3),
        fixed(step.metrics.peakResponseTime_s, 3),
        step.metrics.overshoot_pct.toFixed(1),
      ]);
    }
    lines.push(...table(stepRows, [true, true, true, true, true, false, true, true, true, true]).map((line) => `    ${line}`));
  }
  if (inspection.rejected.length > 0) {
    lines.push('', '  rejected');
    for (const rejection of inspection.rejected) lines.push(`    at ${rejection.onset_s.toFixed(2)} s (${rejection.reasonCode}): ${rejection.reason}`);
  }
  if (inspection.warnings.length > 0) {
    lines.push('', '  warnings');
    for (const warning of inspection.warnings) lines.push(`    - ${warning}`);
  }
  return `${lines.join('\n')}\n`;
}

function median(values: readonly number[]): number | null {
  const finite = values.filter((value) => Number.isFinite(value)).sort((a, b) => a - b);
  if (finite.length === 0) return null;
  const middle = finite.length >> 1;
  return finite.length % 2 === 1 ? finite[middle] : 0.5 * (finite[middle - 1] + finite[middle]);
}

/**
 * One line per log, in order of mean step speed: steps found and rejected, the mean
 * speed of the steps (m/s), and the median steady yaw gain (1/s) and response time (s)
 * over the log's steps — how the yaw response changes with speed at a glance.
 */
export function formatInspectionSummary(inspections: readonly LogInspection[]): string {
  const rows = inspections.map((inspection) => {
    const speeds = inspection.steps.map((step) => step.speed_mps);
    return {
      file: inspection.file,
      speed_mps: speeds.length === 0 ? null : speeds.reduce((sum, speed) => sum + speed, 0) / speeds.length,
      found: inspection.steps.length,
      rejected: inspection.rejected.length,
      gain_perS: median(inspection.steps.map((step) => step.metrics.steadyYawGain_perS)),
      response_s: median(inspection.steps.map((step) => step.metrics.responseTime_s ?? NaN)),
    };
  });
  rows.sort((a, b) => (a.speed_mps ?? Infinity) - (b.speed_mps ?? Infinity));
  const lines = [`summary of ${inspections.length} logs (medians over each log's steps)`];
  const tableRows = [['speed m/s', 'steps', 'rejected', 'yaw gain 1/s', 'response s', 'file']];
  for (const row of rows) {
    tableRows.push([fixed(row.speed_mps, 2), String(row.found), String(row.rejected), fixed(row.gain_perS, 3), fixed(row.response_s, 3), row.file]);
  }
  lines.push(...table(tableRows, [true, true, true, true, true, false]).map((line) => `  ${line}`));
  return `${lines.join('\n')}\n`;
}
