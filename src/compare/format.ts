/** Number wording shared by the comparison's flags, terminal table and Markdown (4 significant digits). */

/** A number in 4 significant digits without trailing zeros in fixed form; '—' for null (no such crossing / not available). */
export function shown(value: number | null, digits = 4): string {
  if (value === null) return '—';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e6) return String(Number(value.toPrecision(digits)));
  return value.toExponential(digits - 1);
}

/** A signed percentage with one decimal, e.g. '+20.0 %'; '—' for null. */
export function shownPercent(value: number | null): string {
  if (value === null) return '—';
  return `${value >= 0 ? '+' : '-'}${Math.abs(value).toFixed(1)} %`;
}

/** A speed in m/s with up to 3 decimals. */
export function shownSpeed(speed_mps: number): string {
  return String(Number(speed_mps.toFixed(3)));
}

/** Rows of cells as aligned text lines (two spaces between columns; right-aligned where asked). */
export function alignedTable(rows: readonly (readonly string[])[], rightAligned: readonly boolean[]): string[] {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((row) => [...row[c]].length)));
  const pad = (cell: string, c: number): string => {
    const fill = ' '.repeat(widths[c] - [...cell].length);
    return rightAligned[c] ? fill + cell : cell + fill;
  };
  return rows.map((row) => row.map(pad).join('  ').trimEnd());
}
