/**
 * A numbered figure: a caption, one or more plot panels, a legend in HTML (every series named, with its
 * line or marker), notes, and the data as a table to fall back on (in a <details>, readable without
 * scripting and by screen readers; left out of print).
 */
import { escapeHtml, htmlTable, type Cell } from './html.js';
import type { IdSource } from './ids.js';
import { colourValue, DASH_PATTERNS, GREYS } from './palette.js';
import { renderPlot } from './plot.js';
import type { Mark, PlotSpec } from './plot-types.js';

export interface FigureSpec {
  /** Anchor of the figure (unique in the report). */
  readonly id: string;
  readonly caption: string;
  readonly panels: readonly PlotSpec[];
  /** 'column' (default): panels one below the other; 'row': side by side, the figure as wide as the page. */
  readonly layout?: 'column' | 'row';
  /** Sentences under the plots (plain text). */
  readonly notes?: readonly string[];
  /** The figure's data as a table. */
  readonly table?: { readonly caption: string; readonly header: readonly string[]; readonly rows: readonly (readonly Cell[])[] };
}

/** Figure numbering and ids of one report. */
export interface RenderContext {
  readonly ids: IdSource;
  nextFigure(): number;
}

const DASHES = DASH_PATTERNS;
const colourOf = colourValue;

/** The legend sample of a mark: a short line, a marker, or a shaded square. */
function swatch(mark: Mark): string {
  const open = '<svg viewBox="0 0 28 12" aria-hidden="true" focusable="false">';
  switch (mark.kind) {
    case 'line':
    case 'rule': {
      const dash = DASHES[mark.style.dash ?? 'solid'];
      return `${open}<path d="M1,6H27" stroke="${colourOf(mark.style.colour)}" stroke-width="${mark.style.width ?? 1.8}"${dash === '' ? '' : ` stroke-dasharray="${dash}"`}/></svg>`;
    }
    case 'points': {
      const colour = colourOf(mark.style.colour);
      if (mark.shape === 'circle' || mark.shape === 'open-circle')
        return `${open}<circle cx="14" cy="6" r="4" fill="${mark.shape === 'circle' ? colour : '#fff'}" stroke="${colour}" stroke-width="1.4"/></svg>`;
      const shapes = { diamond: 'M14,1L19,6L14,11L9,6Z', square: 'M10,2H18V10H10Z', cross: 'M10,2L18,10M18,2L10,10', plus: 'M14,1V11M9,6H19' } as const;
      const filled = mark.shape === 'diamond' || mark.shape === 'square';
      return `${open}<path d="${shapes[mark.shape]}" fill="${filled ? colour : 'none'}" stroke="${colour}" stroke-width="1.8"/></svg>`;
    }
    case 'error-bars':
      return `${open}<path d="M14,1V11M10,1H18M10,11H18" stroke="${colourOf(mark.style.colour)}" stroke-width="1.6" fill="none"/></svg>`;
    case 'band':
      return `${open}<rect x="1" y="2" width="26" height="8" fill="${colourOf(mark.style.colour)}" fill-opacity="${mark.style.opacity ?? 0.25}"/></svg>`;
    case 'region':
      return `${open}<rect x="1" y="1" width="26" height="10" fill="${colourOf(mark.colour)}" fill-opacity="0.13" stroke="${GREYS.grid}"/></svg>`;
    case 'ring':
      return `${open}<circle cx="14" cy="6" r="5" fill="${mark.fill === undefined ? 'none' : colourOf(mark.fill)}"${mark.fill === undefined ? '' : ' fill-opacity="0.13"'} stroke="${colourOf(mark.style.colour)}" stroke-width="1.4"/></svg>`;
  }
}

/** Legend entries of all panels, each label once, in the order first drawn. */
function legend(panels: readonly PlotSpec[]): string {
  const seen = new Map<string, Mark>();
  for (const panel of panels)
    for (const mark of panel.marks) if (mark.legend !== false && mark.label !== '' && !seen.has(mark.label)) seen.set(mark.label, mark);
  if (seen.size === 0) return '';
  return `<ul class="legend">${[...seen.values()].map((mark) => `<li>${swatch(mark)}<span>${escapeHtml(mark.label)}</span></li>`).join('')}</ul>`;
}

/** The figure as HTML. */
export function renderFigure(spec: FigureSpec, context: RenderContext): string {
  const number = context.nextFigure();
  const table =
    spec.table === undefined
      ? ''
      : `<details><summary>Data of figure ${number} as a table</summary><div class="table-scroll">${htmlTable({ caption: spec.table.caption, header: spec.table.header, rows: spec.table.rows })}</div></details>`;
  return [
    `<figure id="${escapeHtml(spec.id)}" class="report-figure${spec.layout === 'row' ? ' row' : ''}">`,
    `<figcaption>Figure ${number}. ${escapeHtml(spec.caption)}</figcaption>`,
    `<div class="panels">${spec.panels.map((panel) => renderPlot(panel, context.ids)).join('\n')}</div>`,
    legend(spec.panels),
    ...(spec.notes ?? []).map((note) => `<p class="note">${escapeHtml(note)}</p>`),
    table,
    `</figure>`,
  ].join('\n');
}
