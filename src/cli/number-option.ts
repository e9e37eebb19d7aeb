import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';

/**
 * A number option, or undefined when absent. yargs gives NaN for `--x abc`; that and an infinite
 * value are refused naming the option (a silent NaN would become a wrong number further on).
 */
export function numberOption<A extends object>(args: A, name: keyof A & string): number | undefined {
  const value: unknown = args[name];
  if (value === undefined) return undefined;
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new SpeedbandError('cli.badNumber', `--${name} is ${quoted(String(value))} — expected a finite number`, { details: { option: name } });
  }
  return value;
}
