/**
 * The C text of the fixed-point header's controller equation: integer helpers (the exact 128-bit product rounded
 * once, a rounded long division, the integer square root), a state struct of int64_t and one sample of THE
 * controller equation of src/controller/firmware-step.ts in the formats of integer-step-plan.ts — the same
 * operations as the floating-point step of c-controller.ts, in integers only (C99, no floating point, no dynamic
 * memory, no library calls). Its distance from the floating-point step is bounded by fixed-point-bound.ts.
 */
import { SpeedbandError } from '../core/errors.js';
import { controllerStateText, STATE_UPDATE_LINES } from './c-controller.js';
import { type IntegerStepPlan, ACCUMULATOR_FRACTIONAL_BITS, COMPLEMENT_FRACTIONAL_BITS, SIGNAL_FRACTIONAL_BITS } from './integer-step-plan.js';

const A = ACCUMULATOR_FRACTIONAL_BITS;
const S = SIGNAL_FRACTIONAL_BITS;
const Q = COMPLEMENT_FRACTIONAL_BITS;

/** The integer helpers, as C99 text. */
function helpersText(prefix: string): string[] {
  return [
    '/* round(a*b / 2^shift), half away from zero, from the exact 128-bit product (0 <= shift <= 62; |a|, |b| < 2^63;',
    ' * the step function only asks for results that fit, see the header comment). */',
    `static inline int64_t ${prefix}_multiply(int64_t a, int64_t b, int shift)`,
    '{',
    '  uint64_t x = a < 0 ? (uint64_t)0 - (uint64_t)a : (uint64_t)a;',
    '  uint64_t y = b < 0 ? (uint64_t)0 - (uint64_t)b : (uint64_t)b;',
    '  uint64_t p00 = (x & 0xffffffffu) * (y & 0xffffffffu);',
    '  uint64_t p01 = (x & 0xffffffffu) * (y >> 32);',
    '  uint64_t p10 = (x >> 32) * (y & 0xffffffffu);',
    '  uint64_t middle = (p00 >> 32) + (p01 & 0xffffffffu) + (p10 & 0xffffffffu);',
    '  uint64_t low = (middle << 32) | (p00 & 0xffffffffu);',
    '  uint64_t high = (x >> 32) * (y >> 32) + (p01 >> 32) + (p10 >> 32) + (middle >> 32);',
    '  uint64_t magnitude = low;',
    '  if (shift > 0) {',
    '    uint64_t half = (uint64_t)1 << (shift - 1);',
    '    low += half;',
    '    high += low < half ? 1u : 0u;',
    '    magnitude = (low >> shift) | (high << (64 - shift));',
    '  }',
    '  return (a < 0) != (b < 0) ? -(int64_t)magnitude : (int64_t)magnitude;',
    '}',
    '',
    '/* round(a * 2^shift / b), half up, for 0 < b < 2^63, by long division (the result fits). */',
    `static inline uint64_t ${prefix}_divide(uint64_t a, uint64_t b, int shift)`,
    '{',
    '  uint64_t quotient = a / b;',
    '  uint64_t remainder = a % b;',
    '  int i;',
    '  for (i = 0; i <= shift; i++) {',
    '    quotient <<= 1;',
    '    remainder <<= 1;',
    '    if (remainder >= b) {',
    '      quotient |= 1u;',
    '      remainder -= b;',
    '    }',
    '  }',
    '  return (quotient + 1u) >> 1;',
    '}',
    '',
    '/* floor(sqrt(x)), bit by bit. */',
    `static inline uint64_t ${prefix}_integer_square_root(uint64_t x)`,
    '{',
    '  uint64_t root = 0;',
    '  uint64_t bit = (uint64_t)1 << 62;',
    '  while (bit > x) {',
    '    bit >>= 2;',
    '  }',
    '  while (bit != 0) {',
    '    if (x >= root + bit) {',
    '      x -= root + bit;',
    '      root = (root >> 1) + bit;',
    '    } else {',
    '      root >>= 1;',
    '    }',
    '    bit >>= 2;',
    '  }',
    '  return root;',
    '}',
    '',
    `static inline uint64_t ${prefix}_magnitude(int64_t x)`,
    '{',
    '  return x < 0 ? (uint64_t)0 - (uint64_t)x : (uint64_t)x;',
    '}',
    '',
    `static inline int64_t ${prefix}_clamp(int64_t x, int64_t low, int64_t high)`,
    '{',
    '  return x > high ? high : (x < low ? low : x);',
    '}',
  ];
}

/**
 * C text of round(a·b / 2^(aBits + bBits − resultBits)): a multiply by a shift ≥ 0, or, when the formats give
 * fewer fractional bits than the result asks, `a` scaled up by the power of two first (exact: a is an int32).
 */
function product(prefix: string, a: string, aBits: number, b: string, bBits: number, resultBits: number): string {
  const shift = aBits + bBits - resultBits;
  if (shift > 62) throw new SpeedbandError('internal', `a product of the integer step shifts by ${shift} bits (at most 62)`);
  return shift >= 0 ? `${prefix}_multiply(${a}, ${b}, ${shift})` : `${prefix}_multiply((int64_t)${a} * ${2n ** BigInt(-shift)}, ${b}, 0)`;
}

/** C text of round(a·2^shift / b) for a shift of any sign (b scaled up when it is negative). */
function quotient(prefix: string, a: string, b: string, shift: number): string {
  return shift >= 0 ? `${prefix}_divide(${a}, ${b}, ${shift})` : `${prefix}_divide(${a}, ${b} * ${2n ** BigInt(-shift)}u, 0)`;
}

/** The helpers, the state struct, its initialisation and the integer step function, as C99 text. */
export function integerControllerText(input: { readonly prefix: string; readonly upper: string; readonly plan: IntegerStepPlan }): string {
  const { prefix, plan } = input;
  const f = plan.fractionalBits;
  const tustin = plan.discretisation === 'tustin';
  const backCalculation = plan.antiWindup === 'back-calculation';
  const td = plan.derivativeTimeBits;
  const kdT = plan.derivativeGainBits;
  const kiT = plan.integralGainBits;
  const c = plan.trackingBits;
  const nt = plan.filterTime.value;
  return [
    ...helpersText(prefix),
    '',
    ...controllerStateText(
      prefix,
      'int64_t',
      '0',
      `/* The controller equation's memory between samples (accumulator units 2^-${A} rad, signals 2^-${S}): start it with ${prefix}_controller_init. */`,
    ),
    '',
    '/*',
    ` * One sample of the controller equation in integers: gains from ${prefix}_lookup at the measured speed; reference,`,
    ` * measurement and feed-forward input in units of 2^-${S} of their units (round(x * 2^${S}), any int32). Returns the`,
    ` * road-wheel angle command in units of 2^-${S} rad, within the command limit. ${tustin ? 'Tustin' : 'Backward Euler'}, ${plan.antiWindup}.`,
    ' */',
    `static inline int32_t ${prefix}_step(const ${prefix}_gains *g, ${prefix}_state *s, int32_t reference, int32_t measurement, int32_t feed_forward_input)`,
    '{',
    `  const int64_t limit = ${plan.commandLimit}; /* command limit, 2^-${A} rad */`,
    `  const int64_t clamp = ${plan.integratorClamp}; /* integrator clamp, 2^-${A} rad */`,
    `  int64_t feed_forward = ${product(prefix, 'g->feed_forward', f.feed_forward, 'feed_forward_input', S, A)};`,
    `  int64_t proportional = ${product(prefix, 'g->kp', f.kp, `${prefix}_multiply(g->setpoint_weight_p, reference, ${f.setpoint_weight_p}) - measurement`, S, A)};`,
    `  int64_t derivative_input = ${prefix}_multiply(g->setpoint_weight_d, reference, ${f.setpoint_weight_d}) - measurement;`,
    '  int64_t difference = s->started ? derivative_input - s->previous_derivative_input : 0;',
    `  int64_t integral_gain = ${product(prefix, 'g->ki', f.ki, String(plan.sampleTime.value), plan.sampleTime.fractionalBits, kiT)}; /* ki*T, 2^-${kiT} */`,
    `  int64_t integrand = ${prefix}_multiply(integral_gain, (int64_t)reference - measurement, ${kiT + S - A}); /* T*ki*e, 2^-${A} rad */`,
    `  int64_t derivative_time = 0; /* Td = kd/kp, 2^-${td} s */`,
    `  int64_t complement; /* q = 1 - p of the derivative filter, 2^-${Q} */`,
    `  int64_t derivative_gain; /* (kd/T)*q, 2^-${kdT} */`,
    '  int64_t derivative;',
    '  int64_t increment;',
    '  int64_t high;',
    '  int64_t low;',
    '  int64_t integral;',
    '  int64_t unlimited;',
    '  int64_t command;',
    '  if (g->kd != 0) {',
    `    derivative_time = (int64_t)${quotient(prefix, `${prefix}_magnitude(g->kd)`, `${prefix}_magnitude(g->kp)`, td + f.kp - f.kd)};`,
    '  }',
    tustin
      ? `  complement = (int64_t)${prefix}_divide(${2n * nt}u, ${nt}u + 2u * (uint64_t)derivative_time, ${Q}); /* N*T = ${nt} * 2^-${td} s */`
      : `  complement = (int64_t)${prefix}_divide(${nt}u, ${nt}u + (uint64_t)derivative_time, ${Q}); /* N*T = ${nt} * 2^-${td} s */`,
    `  derivative_gain = ${prefix}_multiply(${product(prefix, 'g->kd', f.kd, String(plan.inverseSampleTime.value), plan.inverseSampleTime.fractionalBits, kdT)}, complement, ${Q});`,
    `  derivative = ${prefix}_multiply(${2n ** BigInt(Q)} - complement, s->derivative, ${Q}) + ${prefix}_multiply(derivative_gain, difference, ${kdT + S - A});`,
    tustin ? `  increment = ${prefix}_multiply(integrand + s->previous_integrand, 1, 1);` : '  increment = integrand;',
    ...(backCalculation
      ? [
          '  if (s->previous_saturation != 0 && g->ki != 0) {',
          `    uint64_t tracking; /* T/Tt, 2^-${c} */`,
          '    if (g->kd == 0) {',
          `      tracking = ${quotient(prefix, `${prefix}_magnitude(integral_gain)`, `${prefix}_magnitude(g->kp)`, c + f.kp - kiT)};`,
          '    } else {',
          `      tracking = ${prefix}_integer_square_root(${quotient(prefix, `${prefix}_magnitude(${prefix}_multiply(integral_gain, ${plan.sampleTime.value}, ${plan.sampleTime.fractionalBits}))`, `${prefix}_magnitude(g->kd)`, 2 * c + f.kd - kiT)});`,
          '    }',
          `    increment += ${prefix}_multiply((int64_t)tracking, s->previous_saturation, ${c});`,
          '  }',
        ]
      : []),
    '  high = clamp - feed_forward;',
    '  low = -clamp - feed_forward;',
    `  integral = ${prefix}_clamp(s->integral + increment, low, high);`,
    '  unlimited = feed_forward + proportional + integral + derivative;',
    ...(backCalculation
      ? []
      : [
          '  if ((unlimited > limit || unlimited < -limit) && ((increment > 0 && unlimited > 0) || (increment < 0 && unlimited < 0))) {',
          `    integral = ${prefix}_clamp(s->integral, low, high);`,
          '    unlimited = feed_forward + proportional + integral + derivative;',
          '  }',
        ]),
    `  command = ${prefix}_clamp(unlimited, -limit, limit);`,
    ...STATE_UPDATE_LINES,
    `  return (int32_t)${prefix}_multiply(command, 1, ${A - S});`,
    '}',
  ].join('\n');
}
