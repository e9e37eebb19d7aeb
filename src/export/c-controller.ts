/**
 * The C text of the controller equation of the header (c-header.ts): a state struct, its initialisation and
 * one sample of THE controller equation of src/controller/firmware-step.ts — two-degree-of-freedom PID with the
 * filtered derivative, its discretisation, feed-forward, the integrator clamp that leaves room for the feed-forward,
 * anti-windup and the command limit — written operation for operation as the TypeScript computes it, so that the
 * closed loop `speedband simulate`, `build` and `check` judge is the code firmware compiles (a test compiles it with
 * gcc and replays simulated inputs). C99, IEEE 754 double, no dynamic memory, no library calls: the square root
 * (derivative filter time when kp = 0, back-calculation tracking time) is a Newton iteration from above, within one
 * unit in the last place.
 */
import type { AntiWindup } from '../controller/firmware-step.js';
import type { Discretisation } from '../controller/types.js';

export interface ControllerTextInput {
  readonly prefix: string;
  readonly upper: string;
  readonly discretisation: Discretisation;
  readonly antiWindup: AntiWindup;
}

/** The step function's last lines before its return: the state for the next sample (the same names in both headers). */
export const STATE_UPDATE_LINES: readonly string[] = [
  '  s->integral = integral;',
  '  s->derivative = derivative;',
  '  s->previous_derivative_input = derivative_input;',
  '  s->previous_integrand = integrand;',
  '  s->previous_saturation = command - unlimited;',
  '  s->started = 1;',
];

/** The state struct of the step function (its fields of one C type, set to `zero` at start) and its initialisation, as C99 lines. */
export function controllerStateText(prefix: string, type: string, zero: string, comment: string): string[] {
  const fields = ['integral', 'derivative', 'previous_derivative_input', 'previous_integrand', 'previous_saturation'];
  return [
    comment,
    `typedef struct ${prefix}_state {`,
    ...fields.map((field) => `  ${type} ${field};`),
    '  int started;',
    `} ${prefix}_state;`,
    '',
    `static inline void ${prefix}_controller_init(${prefix}_state *state)`,
    '{',
    ...fields.map((field) => `  state->${field} = ${zero};`),
    '  state->started = 0;',
    '}',
  ];
}

/** The state struct, the square root, the initialisation and the step function, as C99 text. */
export function controllerFunctionsText(input: ControllerTextInput): string {
  const { prefix, upper, discretisation, antiWindup } = input;
  const tustin = discretisation === 'tustin';
  const backCalculation = antiWindup === 'back-calculation';
  return [
    ...controllerStateText(prefix, 'double', '0.0', `/* The controller equation's memory between samples: start it with ${prefix}_controller_init. */`),
    '',
    '/* Square root of x >= 0 by Newton iteration from above (within one unit in the last place); 0 for x <= 0. */',
    `static inline double ${prefix}_square_root(double x)`,
    '{',
    '  double r;',
    '  int i;',
    '  if (!(x > 0.0)) {',
    '    return 0.0;',
    '  }',
    '  r = x > 1.0 ? x : 1.0;',
    '  for (i = 0; i < 1100; i++) {',
    '    double next = 0.5 * (r + x / r);',
    '    if (!(next < r)) {',
    '      break;',
    '    }',
    '    r = next;',
    '  }',
    '  return r;',
    '}',
    '',
    '/*',
    " * One sample of the controller equation (the schedule's controller.update): gains from the lookup at the",
    ' * measured speed, the loop reference and measurement, the feed-forward input (read feed_forward_lead_time_s',
    ` * ahead). Returns the road-wheel angle command, rad, within +-${upper}_COMMAND_LIMIT_RAD. ${tustin ? 'Tustin' : 'Backward Euler'}, ${antiWindup}.`,
    ' */',
    `static inline double ${prefix}_step(const ${prefix}_gains *g, ${prefix}_state *s, double reference, double measurement, double feed_forward_input)`,
    '{',
    `  const double t = ${upper}_SAMPLE_TIME_S;`,
    `  const double limit = ${upper}_COMMAND_LIMIT_RAD;`,
    '  double tf = 0.0;',
    '  double feed_forward = g->feed_forward * feed_forward_input;',
    '  double proportional = g->kp * (g->setpoint_weight_p * reference - measurement);',
    '  double derivative_input = g->setpoint_weight_d * reference - measurement;',
    '  double difference = s->started ? derivative_input - s->previous_derivative_input : 0.0;',
    '  double derivative;',
    '  double integrand = g->ki * (reference - measurement);',
    '  double increment;',
    '  double high;',
    '  double low;',
    '  double integral;',
    '  double unlimited;',
    '  double command;',
    '  if (g->kd != 0.0) {',
    `    tf = (g->kp != 0.0 ? g->kd / g->kp : ${prefix}_square_root(g->kd / g->ki)) / ${upper}_DERIVATIVE_FILTER;`,
    '  }',
    tustin
      ? '  derivative = ((2.0 * tf - t) / (2.0 * tf + t)) * s->derivative + ((2.0 * g->kd) / (2.0 * tf + t)) * difference;'
      : '  derivative = (tf / (tf + t)) * s->derivative + (g->kd / (tf + t)) * difference;',
    tustin ? '  increment = (t / 2.0) * (integrand + s->previous_integrand);' : '  increment = t * integrand;',
    ...(backCalculation
      ? [
          '  if (s->previous_saturation != 0.0 && g->ki != 0.0) {',
          `    double ti = g->kp == 0.0 ? ${prefix}_square_root(g->kd / g->ki < 0.0 ? -(g->kd / g->ki) : g->kd / g->ki) : g->kp / g->ki;`,
          '    double td = g->kp == 0.0 ? 0.0 : g->kd / g->kp;',
          `    increment += (t * s->previous_saturation) / (td > 0.0 ? ${prefix}_square_root(ti * td) : ti);`,
          '  }',
        ]
      : []),
    `  high = ${upper}_INTEGRATOR_CLAMP_RAD - feed_forward;`,
    `  low = -${upper}_INTEGRATOR_CLAMP_RAD - feed_forward;`,
    '  integral = s->integral + increment;',
    '  integral = integral > high ? high : (integral < low ? low : integral);',
    '  unlimited = feed_forward + proportional + integral + derivative;',
    ...(backCalculation
      ? []
      : [
          '  if ((unlimited > limit || unlimited < -limit) && ((increment > 0.0 && unlimited > 0.0) || (increment < 0.0 && unlimited < 0.0))) {',
          '    integral = s->integral > high ? high : (s->integral < low ? low : s->integral);',
          '    unlimited = feed_forward + proportional + integral + derivative;',
          '  }',
        ]),
    '  command = unlimited > limit ? limit : (unlimited < -limit ? -limit : unlimited);',
    ...STATE_UPDATE_LINES,
    '  return command;',
    '}',
  ].join('\n');
}
