/** The change from the baseline, as `speedband compare` states it: per-speed gains and margins, worst figures, model drift, flags. */
import type { ReportData } from '../types.js';
import { escapeHtml, wordTable } from './html.js';

export function renderComparisonSection(data: ReportData): string {
  const baseline = data.baseline!;
  const parts = [
    `<p><strong>${escapeHtml(baseline.summary)}</strong> Old: ${escapeHtml(baseline.file)} (${escapeHtml(baseline.schedule.vehicle.name)}, checksum <span class="mono">${escapeHtml(baseline.schedule.checksum.value.slice(0, 16))}…</span>).</p>`,
    `<div class="table-scroll">${wordTable('comparison-speeds', 'Gains and margins, old → new, at the breakpoints of both schedules (margins of each schedule on its own vehicle model)', baseline.speedTable)}</div>`,
    `<div class="table-scroll">${wordTable('comparison-worst', 'Worst margins of each dense check (each on its own vehicle model)', baseline.worstTable)}</div>`,
    baseline.driftTable === null
      ? `<p>Model drift: not available — ${escapeHtml(baseline.driftUnavailable ?? '')}.</p>`
      : `<div class="table-scroll">${wordTable('comparison-drift', 'Model drift: the single-track fit behind each schedule', baseline.driftTable)}</div>`,
    `<h3>Flags</h3>`,
    baseline.flags.length === 0 ? '<p>None.</p>' : `<ul>${baseline.flags.map((flag) => `<li>${escapeHtml(flag)}</li>`).join('')}</ul>`,
    `<p>A comparison is not a verification: the new schedule's own dense check decides.</p>`,
  ];
  return parts.join('\n');
}
