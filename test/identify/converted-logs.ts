import { mkdirSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

/**
 * Copies of demo logs with channels recorded in other units (each value multiplied by a factor) or
 * left out: what a logger in km/h or steering-wheel degrees writes. `only` keeps files whose name matches.
 */
export function convertLogs(
  from: string,
  to: string,
  change: { readonly scale?: Readonly<Record<string, number>>; readonly drop?: readonly string[]; readonly only?: RegExp },
): string[] {
  mkdirSync(to, { recursive: true });
  const written: string[] = [];
  for (const name of readdirSync(from)
    .filter((file) => file.endsWith('.csv') && (change.only?.test(file) ?? true))
    .sort()) {
    const [header, ...rows] = readFileSync(join(from, name), 'utf8').trimEnd().split('\n');
    const columns = header.split(',');
    const keep = columns.map((column) => !(change.drop ?? []).includes(column));
    const factor = columns.map((column) => change.scale?.[column] ?? 1);
    const convert = (line: string): string =>
      line
        .split(',')
        .flatMap((cell, k) => (keep[k] ? [factor[k] === 1 ? cell : String(Number((Number(cell) * factor[k]).toPrecision(9)))] : []))
        .join(',');
    const path = join(to, name);
    writeFileSync(path, `${columns.filter((_, k) => keep[k]).join(',')}\n${rows.map(convert).join('\n')}\n`);
    written.push(path);
  }
  return written;
}
