/**
 * Units as users write them ("km/h", "mi/h", "deg/s", "ms", "min", "ft/s^2"…), converted to the SI
 * unit of a quantity with mathjs's unit system (loaded lazily, src/core/mathjs.ts). The answer is data
 * — a factor, the quantity actually found, or why the text is not a unit — and the caller words the
 * error with its own context (which channel, which file).
 *
 * One trade convention mathjs does not know: "g" for an acceleration is the standard acceleration of
 * gravity g_n = 9.80665 m/s² (accelerometers report in it); for mathjs "g" is the gram.
 */
import { loadMathjs } from './mathjs.js';
import { libraryMessage } from './quote.js';
import { STANDARD_GRAVITY_MPS2 } from './units.js';

/** The physical quantities a unit may be asked for. */
export type PhysicalQuantity = 'time' | 'speed' | 'angle' | 'angularRate' | 'acceleration';

/** The SI unit each quantity is held in inside the program, as mathjs writes it. */
export const SI_UNITS: Readonly<Record<PhysicalQuantity, string>> = {
  time: 's',
  speed: 'm/s',
  angle: 'rad',
  angularRate: 'rad/s',
  acceleration: 'm/s^2',
};

/** Longer unit texts are refused before parsing (no unit of these quantities needs more). */
export const MAXIMUM_UNIT_LENGTH = 64;

export type UnitReading =
  /** Multiply a value in the unit by `toSi` to get the quantity's SI unit. */
  | { readonly kind: 'converted'; readonly toSi: number }
  /** A unit, but of another quantity, in words: "an angle", "a mass", "of dimension (kg m^2) / s^3". */
  | { readonly kind: 'wrongQuantity'; readonly found: string }
  /** Not a unit at all (unknown name, a number in it, too long), with mathjs's reason. */
  | { readonly kind: 'notAUnit'; readonly reason: string };

/** Names of quantities for messages, tried in order; the first whose SI unit has the same dimension names it. */
const QUANTITY_WORDS: readonly (readonly [string, string])[] = [
  ['s', 'a time'],
  ['m/s', 'a speed'],
  ['rad', 'an angle'],
  ['rad/s', 'an angular rate'],
  ['m/s^2', 'an acceleration'],
  ['m', 'a length'],
  ['kg', 'a mass'],
  ['Hz', 'a frequency (1/s, without an angle: an angular rate is rad/s or deg/s)'],
  ['rad/s^2', 'an angular acceleration'],
  ['N', 'a force'],
  ['m^2', 'an area'],
  ['K', 'a temperature'],
];

/** How the quantity reads in a sentence ("a speed", "an angle"). */
export function quantityWords(quantity: PhysicalQuantity): string {
  return QUANTITY_WORDS.find(([unit]) => unit === SI_UNITS[quantity])?.[1] ?? quantity;
}

/**
 * Read a unit expression for a quantity: the factor to the quantity's SI unit (mathjs's unit
 * definitions), or what the text is instead. A bare "g" for an acceleration is g_n.
 */
export async function readUnitExpression(expression: string, quantity: PhysicalQuantity): Promise<UnitReading> {
  const text = expression.trim();
  if (text === '') return { kind: 'notAUnit', reason: 'it is empty' };
  if (text.length > MAXIMUM_UNIT_LENGTH) return { kind: 'notAUnit', reason: `it is ${text.length} characters long (at most ${MAXIMUM_UNIT_LENGTH})` };
  if (quantity === 'acceleration' && text === 'g') return { kind: 'converted', toSi: STANDARD_GRAVITY_MPS2 };
  const math = await loadMathjs();
  let unit;
  try {
    unit = math.unit(text);
  } catch (error) {
    return { kind: 'notAUnit', reason: libraryMessage(error instanceof Error ? error.message : String(error)) };
  }
  if (unit.value !== null) return { kind: 'notAUnit', reason: 'it holds a number; give the unit alone (e.g. km/h, not 3.6 km/h)' };
  const si = math.unit(SI_UNITS[quantity]);
  if (!unit.equalBase(si)) {
    const named = QUANTITY_WORDS.find(([reference]) => unit.equalBase(math.unit(reference)));
    const dimensionless = unit.dimensions.every((power) => power === 0);
    return { kind: 'wrongQuantity', found: named?.[1] ?? (dimensionless ? 'a plain number (no dimension)' : `of dimension ${unit.toSI().formatUnits()}`) };
  }
  const toSi = math.unit(1, text).toNumber(SI_UNITS[quantity]);
  if (!(Number.isFinite(toSi) && toSi > 0)) return { kind: 'notAUnit', reason: `its factor to ${SI_UNITS[quantity]} is ${toSi}` };
  return { kind: 'converted', toSi };
}
