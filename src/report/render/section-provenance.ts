/** The record behind the schedule: tool versions, checksum, every input with its SHA-256, the model, the rule, the controller equation, the limits, the plan. */
import { limitWords } from './limit-marks.js';
import type { ReportData } from '../types.js';
import { escapeHtml, fixedNumber, htmlTable, numberCell, shownNumber, textCell, type Cell } from './html.js';

/** A record's fields as rows sorted by name (the same order however the record was built); numbers exact in `<data>`, nested values as JSON text. */
function recordRows(record: Readonly<Record<string, unknown>>): Cell[][] {
  return Object.entries(record)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([name, value]) => [
      textCell(name),
      typeof value === 'number' ? numberCell(value, name, shownNumber(value, 6)) : textCell(typeof value === 'string' ? value : JSON.stringify(value), name),
    ]);
}

export function renderProvenanceSection(data: ReportData): string {
  const { schedule } = data;
  const { provenance, controller, checksum } = schedule;
  const limits = schedule.check.thresholds;
  const parts = [
    `<dl>`,
    `<dt>Report written by</dt><dd>speedband ${escapeHtml(data.toolVersion)} from <span class="mono">${escapeHtml(data.scheduleFile)}</span></dd>`,
    `<dt>Schedule written by</dt><dd>${escapeHtml(provenance.tool)} ${escapeHtml(provenance.toolVersion)}, format ${escapeHtml(schedule.format)} version ${schedule.formatVersion}</dd>`,
    `<dt>Checksum (${escapeHtml(checksum.algorithm)})</dt><dd><span class="mono" id="checksum">${escapeHtml(checksum.value)}</span> — ${escapeHtml(checksum.canonicalForm)}</dd>`,
    `<dt>Vehicle</dt><dd>${escapeHtml(schedule.vehicle.name)} (<span class="mono">${escapeHtml(schedule.vehicle.file)}</span>, SHA-256 <span class="mono">${escapeHtml(schedule.vehicle.sha256)}</span>)</dd>`,
    `<dt>Loop</dt><dd>${escapeHtml(schedule.loop.kind)}${schedule.loop.kind === 'path' ? ` (preview ${shownNumber(schedule.loop.preview_m ?? null)} m from the ${escapeHtml(schedule.loop.referencePoint ?? '')})` : ''}; ${escapeHtml(schedule.loop.error)}</dd>`,
    `<dt>Rule</dt><dd>${escapeHtml(provenance.rule.name)}${provenance.rule.citation === undefined ? '' : ` — ${escapeHtml(provenance.rule.citation)}`}; parameters as written: <span class="mono">${escapeHtml(JSON.stringify(provenance.rule.parameters))}</span></dd>`,
    `<dt>Controller the gains assume</dt><dd>${escapeHtml(controller.form)} PID, ${escapeHtml(controller.discretisation)} at ${shownNumber(controller.sampleTime_s)} s, computation latency ${shownNumber(controller.computationLatency_s)} s, derivative filter N = ${shownNumber(controller.derivativeFilter)}, integrator clamped to ±${shownNumber(controller.integratorClamp_rad)} rad.<br>`,
    `<span class="mono">${escapeHtml(controller.equation)}</span><br>${controller.update.map((line) => `<span class="mono">${escapeHtml(line)}</span>`).join('<br>')}<br>${escapeHtml(controller.integration)}</dd>`,
    `<dt>Interpolation</dt><dd>${escapeHtml(schedule.interpolation.description)}</dd>`,
    `<dt>Acceptance limits</dt><dd>lower gain margin ≤ ${limitWords(limits.maximumLowerGainMargin_dB)} dB, upper gain margin ≥ ${limitWords(limits.minimumUpperGainMargin_dB)} dB, phase margin ≥ ${limitWords(limits.minimumPhaseMargin_deg)}°, peak sensitivity ≤ ${limitWords(limits.maximumSensitivityPeak)}, peak complementary sensitivity ≤ ${limitWords(limits.maximumComplementarySensitivityPeak)}, delay margin ≥ ${limitWords(limits.minimumDelayMargin_s)} s</dd>`,
    ...(data.models === null
      ? []
      : [
          `<dt>Identification</dt><dd><span class="mono">${escapeHtml(data.models.file)}</span>, written by speedband ${escapeHtml(data.models.content.tool.version)} from the same vehicle file and logs (checked by SHA-256)</dd>`,
        ]),
    `</dl>`,
    `<div class="table-scroll">${htmlTable({
      id: 'inputs',
      caption: 'Every input of the schedule, with its SHA-256',
      header: ['file', 'role', 'SHA-256'],
      rows: provenance.inputs.map((input) => [
        textCell(input.file, 'file'),
        textCell(input.role, 'role'),
        { html: `<span class="mono">${escapeHtml(input.sha256)}</span>`, field: 'sha256' },
      ]),
    })}</div>`,
    `<div class="table-scroll">${htmlTable({ id: 'model', caption: `The vehicle model the gains were tuned and checked on: ${schedule.check.model.description}`, header: ['quantity', 'value'], rows: recordRows(provenance.model) })}</div>`,
  ];
  const atBreakpoints = provenance.rule.parametersAtBreakpoints ?? [];
  if (atBreakpoints.length > 0) {
    const names = [...new Set(atBreakpoints.flatMap((entry) => Object.keys(entry.parameters)))];
    parts.push(
      htmlTable({
        id: 'rule-parameters',
        caption: 'Rule parameters as resolved at each breakpoint',
        header: ['speed m/s', ...names],
        rows: atBreakpoints.map((entry) => [
          numberCell(entry.speed_mps, 'speed_mps', fixedNumber(entry.speed_mps, 2)),
          ...names.map((name) =>
            typeof entry.parameters[name] === 'number'
              ? numberCell(entry.parameters[name] as number, name)
              : textCell(String(entry.parameters[name] ?? '—'), name),
          ),
        ]),
      }),
    );
  }
  for (const edit of provenance.handEdits ?? []) {
    parts.push(
      `<p class="notice">Hand edit: ${escapeHtml(edit.statement)} Sections changed: ${escapeHtml(edit.changedSections.join(', ') || 'not known')}; re-verified by speedband ${escapeHtml(edit.toolVersion)} on ${escapeHtml(edit.model)} at ${edit.gridSize} speeds.</p>`,
    );
  }
  parts.push(`<details><summary>The resolved plan (JSON)</summary><pre>${escapeHtml(JSON.stringify(provenance.plan, null, 2))}</pre></details>`);
  return parts.join('\n');
}
