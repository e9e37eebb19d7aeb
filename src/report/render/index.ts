/**
 * The report as one self-contained HTML file: inline CSS and SVG, no script, no font or image fetched (a
 * Content-Security-Policy of default-src 'none' says so to the browser), readable with scripting off and
 * printable on A4 and Letter. The cautions come first, then — after a vehicle change — whether the old gains
 * still hold; then the sections whose data is present (sections.ts). Same data → the same bytes.
 *
 * This module and everything it imports form the report chunk of the CLI bundle (scripts/bundle-cli.mjs),
 * loaded only by the report path: it imports d3 and our render code, never a module with state.
 */
import type { ReportData } from '../types.js';
import type { RenderContext } from './figure.js';
import { escapeHtml, fixedNumber } from './html.js';
import { idSource } from './ids.js';
import { SECTIONS } from './sections.js';
import { REPORT_CSS } from './style.js';

function header(data: ReportData): string {
  const { schedule, baseline } = data;
  const passed = schedule.status === 'passed';
  const range = `${fixedNumber(schedule.check.range.minimum_mps, 2)}–${fixedNumber(schedule.check.range.maximum_mps, 2)} m/s`;
  const parts = [
    `<h1>Steering gain schedule — ${escapeHtml(schedule.vehicle.name)}</h1>`,
    `<p><span class="status ${passed ? 'passed' : 'failed'}">${passed ? 'checks passed' : 'checks FAILED'}</span> ` +
      `${escapeHtml(schedule.loop.kind)} loop, rule ${escapeHtml(schedule.provenance.rule.name)}, ${schedule.breakpoints.length} breakpoints over ${range}; ` +
      `margins checked at ${schedule.check.gridSize} speeds, time-domain figures at the breakpoints; checksum <span class="mono">${escapeHtml(schedule.checksum.value.slice(0, 16))}…</span></p>`,
    `<section class="cautions" role="note" aria-labelledby="cautions-title"><h2 id="cautions-title">Safety</h2><ul>${schedule.cautions.map((caution) => `<li>${escapeHtml(caution)}</li>`).join('')}</ul></section>`,
  ];
  if (!passed) {
    const td = schedule.check.timeDomain;
    const failed = [
      ...(schedule.check.passed ? [] : [`its dense check at ${schedule.check.failedSpeeds} of ${schedule.check.gridSize} speeds`]),
      ...(td.passed ? [] : [`the time-domain limits at ${td.failures.length} of ${schedule.breakpoints.length} breakpoints`]),
    ];
    parts.push(`<p class="notice">This schedule failed ${failed.join(' and ')} and was written for review only (--allow-failing). Do not run it.</p>`);
  }
  if (baseline !== null) {
    const fails = baseline.oldGainsOnNewVehicle.available && !baseline.oldGainsOnNewVehicle.passed;
    parts.push(
      `<section class="key-fact${fails ? ' fails' : ''}" id="old-gains" aria-labelledby="old-gains-title"><h2 id="old-gains-title">After the change: the old gains on the new vehicle</h2>` +
        `<p><strong>${escapeHtml(baseline.lead)}</strong></p>${baseline.leadModel === null ? '' : `<p>${escapeHtml(`The old schedule ${baseline.file}, ${baseline.leadModel}.`)}</p>`}</section>`,
    );
  }
  if (data.checkReproduced === false) {
    parts.push(
      `<p class="notice">The dense check re-run for these plots does not reproduce the worst figures the schedule records exactly (another speedband version wrote it?): the tables show the file's figures, the plots the re-run.</p>`,
    );
  }
  return `<header class="report">${parts.join('\n')}</header>`;
}

/** The titles of the sections the report of `data` holds, in order. */
export function reportSectionTitles(data: ReportData): string[] {
  return SECTIONS.filter((section) => section.present(data)).map((section) => section.title);
}

/** The report (see the file comment). */
export function renderReport(data: ReportData): string {
  const ids = idSource();
  let figures = 0;
  const context: RenderContext = { ids, nextFigure: () => (figures += 1) };
  const sections = SECTIONS.filter((section) => section.present(data));
  const body = sections.map(
    (section) =>
      `<section id="${section.id}" aria-labelledby="${section.id}-title"><h2 id="${section.id}-title">${escapeHtml(section.title)}</h2>\n${section.render(data, context)}\n</section>`,
  );
  const contents = `<nav class="contents" aria-label="Contents"><ol>${sections.map((section) => `<li><a href="#${section.id}">${escapeHtml(section.title)}</a></li>`).join('')}</ol></nav>`;
  return [
    '<!DOCTYPE html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8">',
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    `<meta name="generator" content="speedband ${escapeHtml(data.toolVersion)}">`,
    `<title>Steering gain schedule report — ${escapeHtml(data.schedule.vehicle.name)}</title>`,
    `<style>${REPORT_CSS}</style>`,
    '</head>',
    '<body>',
    header(data),
    contents,
    `<main>\n${body.join('\n')}\n</main>`,
    `<footer class="report"><p>${escapeHtml(data.schedule.cautions.join(' '))}</p><p>speedband ${escapeHtml(data.toolVersion)} · schedule checksum <span class="mono">${escapeHtml(data.schedule.checksum.value)}</span></p></footer>`,
    '</body>',
    '</html>',
    '',
  ].join('\n');
}
