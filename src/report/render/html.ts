/**
 * HTML text of the report: escaping, numbers as people read them with the exact value kept for machines
 * (`<data value="…">`), and tables. Pure string functions; nothing here touches a file or the clock.
 */

const ESCAPES: Readonly<Record<string, string>> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Text for HTML content or a quoted attribute value. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (character) => ESCAPES[character]);
}

const SUPERSCRIPTS: Readonly<Record<string, string>> = { '-': '⁻', '+': '', 0: '⁰', 1: '¹', 2: '²', 3: '³', 4: '⁴', 5: '⁵', 6: '⁶', 7: '⁷', 8: '⁸', 9: '⁹' };

/** A number in `significant` digits, plain decimals from 1e-5 to 1e6, else a·10ⁿ; a true minus sign; '—' for null or non-finite. */
export function shownNumber(value: number | null | undefined, significant = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-5 && magnitude < 1e6) return String(Number(value.toPrecision(significant))).replace('-', '−');
  const [mantissa, exponent] = value.toExponential(significant - 1).split('e');
  return `${String(Number(mantissa)).replace('-', '−')}·10${[...exponent].map((character) => SUPERSCRIPTS[character]).join('')}`;
}

/** A number with a fixed count of decimals (speeds, degrees), true minus sign; '—' for null. */
export function fixedNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = value.toFixed(decimals);
  return Number(text) === 0 ? text.replace('-', '') : text.replace('-', '−');
}

/** A number shown rounded, its exact value in a `<data>` element (what the tests and any script read back); '—' for null. */
export function dataNumber(value: number | null | undefined, shown: string = shownNumber(value)): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return `<data value="${String(value)}">${escapeHtml(shown)}</data>`;
}

/** One table cell: text (escaped) or ready HTML; `field` names the quantity for machines (data-field). */
export interface Cell {
  readonly html: string;
  readonly field?: string;
  readonly numeric?: boolean;
}

export const textCell = (text: string, field?: string): Cell => ({ html: escapeHtml(text), ...(field === undefined ? {} : { field }) });
export const numberCell = (value: number | null | undefined, field: string, shown?: string): Cell => ({ html: dataNumber(value, shown), field, numeric: true });

/** A table with a caption and a header row; `id` for links and tests. */
export function htmlTable(options: {
  readonly id?: string;
  readonly caption: string;
  readonly header: readonly string[];
  readonly rows: readonly (readonly Cell[])[];
  readonly className?: string;
}): string {
  const head = options.header.map((name) => `<th scope="col">${escapeHtml(name)}</th>`).join('');
  const cell = (c: Cell): string =>
    `<td${c.field === undefined ? '' : ` data-field="${escapeHtml(c.field)}"`}${c.numeric === true ? ' class="number"' : ''}>${c.html}</td>`;
  const body = options.rows.map((row) => `<tr>${row.map(cell).join('')}</tr>`).join('\n');
  return (
    `<table${options.id === undefined ? '' : ` id="${escapeHtml(options.id)}"`}${options.className === undefined ? '' : ` class="${options.className}"`}>` +
    `<caption>${escapeHtml(options.caption)}</caption><thead><tr>${head}</tr></thead>\n<tbody>\n${body}\n</tbody></table>`
  );
}

/** A table of words (compare's tables). */
export function wordTable(id: string, caption: string, table: { readonly header: readonly string[]; readonly rows: readonly (readonly string[])[] }): string {
  return htmlTable({ id, caption, header: table.header, rows: table.rows.map((row) => row.map((text) => textCell(text))) });
}
