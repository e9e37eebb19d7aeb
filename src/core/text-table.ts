/**
 * Fixed-width text tables for terminal reports: the first row is the heading, columns are
 * separated by two spaces, each column left- or right-aligned (numbers right).
 */
export function textTable(rows: readonly (readonly string[])[], rightAligned: readonly boolean[]): string[] {
  if (rows.length === 0) return [];
  const widths = rows[0].map((_, column) => Math.max(...rows.map((row) => (row[column] ?? '').length)));
  return rows.map((row) =>
    row
      .map((cell, column) => (rightAligned[column] ? cell.padStart(widths[column]) : cell.padEnd(widths[column])))
      .join('  ')
      .trimEnd(),
  );
}

/** A number with fixed decimals, or an em dash for null / non-finite (an absent margin). */
export function fixedOrDash(value: number | null | undefined, digits: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toFixed(digits);
}

/** A number to `digits` significant figures, or an em dash for null / non-finite. */
export function precisionOrDash(value: number | null | undefined, digits: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toPrecision(digits);
}
