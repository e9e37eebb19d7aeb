/**
 * The unit a log column was recorded in, as the user wrote it, and its factor to the channel's SI
 * unit. The built-in table below converts the default units and the common ones without loading
 * mathjs (the fast path; test/log/column-units.test.ts checks every entry against mathjs). Any other
 * unit expression of the channel's quantity ("mi/h", "ft/s", "min", "grad", "ft/s^2"…) is converted
 * with mathjs's unit system by `resolveColumnUnit`, which is asynchronous because mathjs is loaded
 * only then. Two units are ours, not mathjs's: `steering-wheel-UNIT` (an angle at the steering wheel,
 * divided by the vehicle's steering ratio to give road-wheel angle) and `g` for an acceleration
 * (standard gravity; see src/core/unit-expressions.ts).
 */
import { SpeedbandError, type ErrorLocation } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { quantityWords, readUnitExpression, type PhysicalQuantity } from '../core/unit-expressions.js';
import { MPS_PER_KPH, MPS_PER_MPH, RADIANS_PER_DEGREE, SECONDS_PER_MILLISECOND, STANDARD_GRAVITY_MPS2 } from '../core/units.js';
import { CHANNEL_DEFINITIONS, type ChannelName } from './columns.js';

/** How to turn a column's values into SI. */
export interface UnitConversion {
  /** The unit as written (e.g. 'km/h', 'steering-wheel-deg'). */
  readonly unit: string;
  readonly quantity: PhysicalQuantity;
  /** Multiply a recorded value by this to get SI (before the steering ratio for steering-wheel units). */
  readonly toSi: number;
  /** True when the value is a steering-wheel angle (divide by the steering ratio as well). */
  readonly steeringWheel: boolean;
}

/** A steering-wheel angle: this prefix, then an angle unit (`steering-wheel-deg`, `steering-wheel-rad`, `steering-wheel-grad`…). */
export const STEERING_WHEEL_PREFIX = 'steering-wheel-';

const entry = (quantity: PhysicalQuantity, toSi: number, steeringWheel = false) => ({ quantity, toSi, steeringWheel });

/** Units converted without mathjs: the channels' SI units, the units loggers commonly write, and ours. */
export const BUILT_IN_UNITS: Readonly<Record<string, Omit<UnitConversion, 'unit'>>> = {
  s: entry('time', 1),
  ms: entry('time', SECONDS_PER_MILLISECOND),
  'm/s': entry('speed', 1),
  'km/h': entry('speed', MPS_PER_KPH),
  mph: entry('speed', MPS_PER_MPH),
  rad: entry('angle', 1),
  deg: entry('angle', RADIANS_PER_DEGREE),
  'steering-wheel-rad': entry('angle', 1, true),
  'steering-wheel-deg': entry('angle', RADIANS_PER_DEGREE, true),
  'rad/s': entry('angularRate', 1),
  'deg/s': entry('angularRate', RADIANS_PER_DEGREE),
  'm/s2': entry('acceleration', 1),
  'm/s^2': entry('acceleration', 1),
  g: entry('acceleration', STANDARD_GRAVITY_MPS2),
};

/** A few units of each quantity, for hints. */
const EXAMPLES: Readonly<Record<PhysicalQuantity, string>> = {
  time: 's, ms, min',
  speed: 'm/s, km/h, mi/h (or mph), ft/s',
  angle: 'rad, deg, steering-wheel-deg',
  angularRate: 'rad/s, deg/s',
  acceleration: 'm/s^2, g, ft/s^2',
};

/** The built-in conversion of a unit, or undefined when it needs mathjs (`resolveColumnUnit`). */
export function builtInConversion(unit: string): UnitConversion | undefined {
  const known = Object.hasOwn(BUILT_IN_UNITS, unit) ? BUILT_IN_UNITS[unit] : undefined;
  return known === undefined ? undefined : { unit, ...known };
}

/** Where a unit was written, for error messages: a location (profile file and JSON path) and/or words before the message. */
export interface UnitOrigin {
  readonly location?: ErrorLocation;
  /** E.g. `--column "speed_mps=v:knots"`. */
  readonly label?: string;
}

const prefixed = (origin: UnitOrigin, message: string): string => (origin.label === undefined ? message : `${origin.label}: ${message}`);

/** `log.unitMismatch`: "`deg` is an angle; speed_mps (vehicle speed) needs a speed — …". */
function unitMismatchError(channel: ChannelName, unit: string, found: string, origin: UnitOrigin): SpeedbandError {
  const quantity = CHANNEL_DEFINITIONS[channel].quantity;
  return new SpeedbandError(
    'log.unitMismatch',
    prefixed(
      origin,
      `${quoted(unit)} is ${found}; ${channel} (${CHANNEL_DEFINITIONS[channel].describe}) needs ${quantityWords(quantity)} — give a unit such as ${EXAMPLES[quantity]}`,
    ),
    { location: origin.location ?? {}, details: { channel, unit, found } },
  );
}

/** The conversion, when its quantity is the channel's; else log.unitMismatch naming both. */
export function checkUnitQuantity(channel: ChannelName, conversion: UnitConversion, origin: UnitOrigin): UnitConversion {
  if (conversion.quantity !== CHANNEL_DEFINITIONS[channel].quantity) {
    const found = conversion.steeringWheel ? 'a steering-wheel angle' : quantityWords(conversion.quantity);
    throw unitMismatchError(channel, conversion.unit, conversion.steeringWheel ? found : unitNoun(conversion.unit, found), origin);
  }
  return conversion;
}

/** "g" on a non-acceleration channel is read by mathjs as the gram; say both. */
const unitNoun = (unit: string, found: string): string => (unit === 'g' ? `${found} (standard gravity; for mathjs "g" is the gram)` : found);

/**
 * The conversion of `unit` for `channel`: built-in units at once, a steering-wheel angle in any angle
 * unit, any other unit expression through mathjs. Throws `log.unknownUnit` (not a unit, with mathjs's
 * reason) or `log.unitMismatch` (a unit of another quantity, naming both).
 */
export async function resolveColumnUnit(channel: ChannelName, unit: string, origin: UnitOrigin = {}): Promise<UnitConversion> {
  const builtIn = builtInConversion(unit);
  if (builtIn !== undefined) return checkUnitQuantity(channel, builtIn, origin);
  const steeringWheel = unit.startsWith(STEERING_WHEEL_PREFIX);
  const expression = steeringWheel ? unit.slice(STEERING_WHEEL_PREFIX.length) : unit;
  const wanted = steeringWheel ? 'angle' : CHANNEL_DEFINITIONS[channel].quantity;
  const reading = await readUnitExpression(expression, wanted);
  if (reading.kind === 'notAUnit') {
    const quantity = CHANNEL_DEFINITIONS[channel].quantity;
    throw new SpeedbandError(
      'log.unknownUnit',
      prefixed(
        origin,
        `${quoted(unit)} is not a unit (${reading.reason}) — give ${quantityWords(quantity)} unit for ${channel} such as ${EXAMPLES[quantity]} (mathjs unit names)`,
      ),
      { location: origin.location ?? {}, details: { channel, unit, reason: reading.reason } },
    );
  }
  if (reading.kind === 'wrongQuantity') throw unitMismatchError(channel, steeringWheel ? expression : unit, reading.found, origin);
  return checkUnitQuantity(channel, { unit, quantity: wanted, toSi: reading.toSi, steeringWheel }, origin);
}
