/**
 * The report's HTML from its data, and writing it. The renderer (render/index.ts, with d3) is imported only
 * here and only dynamically: the CLI bundle turns this import into its report chunk (scripts/bundle-cli.mjs),
 * so no other command loads it.
 */
import { writeFileAtomic, type WriteOptions, type WriteOutcome } from '../core/files.js';
import type { ReportData } from './types.js';

/** The report as one HTML file (UTF-8 text) and the titles of the sections it holds. */
export async function renderReportHtml(data: ReportData): Promise<{ readonly html: string; readonly sections: readonly string[] }> {
  const { renderReport, reportSectionTitles } = await import('./render/index.js');
  return { html: renderReport(data), sections: reportSectionTitles(data) };
}

/** Render and write the report atomically; a different existing file is replaced only with `options.force`. */
export async function writeReport(
  path: string,
  data: ReportData,
  options: WriteOptions,
): Promise<{ readonly outcome: WriteOutcome; readonly bytes: number; readonly sections: readonly string[] }> {
  const { html, sections } = await renderReportHtml(data);
  return { outcome: writeFileAtomic(path, html, options), bytes: Buffer.byteLength(html, 'utf8'), sections };
}
