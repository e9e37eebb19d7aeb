/**
 * The public entry point for one operating point: a plant (rational × delay) under a
 * PID in any of the three forms, optionally run by firmware at a sample time with a
 * computation latency, analysed by analyseOpenLoop.
 */
import { SpeedbandError } from '../core/errors.js';
import { CONTROLLER_DEFAULTS } from '../controller/defaults.js';
import { discretePidCoefficients } from '../controller/discrete.js';
import { idealToParallel, seriesToParallel } from '../controller/pid-forms.js';
import { pidTransferFunction } from '../controller/pid.js';
import type { Discretisation, PidForm, PidGains } from '../controller/types.js';
import { multiplyPolynomials } from '../lti/polynomial.js';
import { analyseOpenLoop } from './analyse-open-loop.js';
import type { LoopMargins, OpenLoop } from './types.js';
import { checkCoefficients } from './validate-loop.js';

/**
 * A plant and a PID. Plant coefficients highest power first, delay in s.
 * PID fields by `form` (default 'parallel'):
 * - parallel: C = kp + ki/s + kd·s/(1 + Tf·s)                  (kp, ki, kd as PidGains)
 * - ideal:    C = Kc·(1 + 1/(Ti·s) + Td·s/(1 + Tf·s)), read as kp = Kc, ki = Ti (s), kd = Td (s)
 * - series:   C = Kc·(1 + 1/(τI·s))·(1 + τD·s), read as kp = Kc, ki = τI (s), kd = τD (s),
 *             converted to ideal by Kc' = Kc(1 + τD/τI), Ti = τI + τD, Td = τIτD/(τI + τD)
 *             (DOMAIN.md §4) and then filtered like the others.
 * For ideal and series forms ki = Infinity means no integral action.
 * The derivative filter is Tf = Td/N with N = derivativeFilter (default 10, common
 * practice; Infinity = unfiltered — only proper with a plant of relative degree ≥ 1).
 */
export interface LoopDescription {
  readonly plant: { readonly numerator: readonly number[]; readonly denominator: readonly number[]; readonly delay_s: number };
  readonly pid: { readonly kp: number; readonly ki: number; readonly kd: number; readonly derivativeFilter?: number; readonly form?: PidForm };
  /** Firmware sample time, s: the controller is then the discrete PID at this rate and the hold adds Ts/2 of delay. Omit for a continuous controller. */
  readonly sampleTime_s?: number;
  /** Discretisation of the discrete PID (default backward Euler). */
  readonly discretisation?: Discretisation;
  /** Computation latency from sample to actuator, s (default 0), added to the plant delay. */
  readonly latency_s?: number;
}

/** Defaults of `analyseLoop`, in one place. */
export const LOOP_DEFAULTS = {
  form: 'parallel' as PidForm,
  derivativeFilter: CONTROLLER_DEFAULTS.derivativeFilter,
  discretisation: CONTROLLER_DEFAULTS.discretisation,
  latency_s: 0,
} as const;

const badPid = (message: string, jsonPath: string, details: Record<string, unknown>): never => {
  throw new SpeedbandError('verify.invalidController', message, { location: { jsonPath }, details });
};

/**
 * The PID of `description.pid` in parallel form (kp, ki, kd), converting the ideal and
 * series forms as documented on LoopDescription. Throws `verify.invalidController` for
 * a non-finite or non-positive time, and the controller's own typed errors.
 */
export function parallelGainsOf(pid: LoopDescription['pid']): PidGains {
  const form = pid.form ?? LOOP_DEFAULTS.form;
  for (const name of ['kp', 'ki', 'kd'] as const) {
    const value = pid[name];
    const allowInfinite = name === 'ki' && form !== 'parallel';
    if (typeof value !== 'number' || Number.isNaN(value) || (!Number.isFinite(value) && !(allowInfinite && value === Infinity))) {
      badPid(`pid.${name} is ${String(value)} — expected a finite number${allowInfinite ? ' (or Infinity for no integral action)' : ''}`, `pid.${name}`, { ...pid });
    }
  }
  if (form === 'parallel') return { kp: pid.kp, ki: pid.ki, kd: pid.kd };
  if (form !== 'ideal' && form !== 'series') {
    return badPid(`pid.form is '${String(form)}' — expected 'parallel', 'ideal' or 'series'`, 'pid.form', { form });
  }
  if (!(pid.ki > 0)) badPid(`pid.ki is read as the ${form} integral time and is ${pid.ki} s — expected a time > 0 s, or Infinity for no integral action`, 'pid.ki', { ...pid });
  if (!(pid.kd >= 0)) badPid(`pid.kd is read as the ${form} derivative time and is ${pid.kd} s — expected a time ≥ 0 s`, 'pid.kd', { ...pid });
  const times = { gain: pid.kp, integralTime_s: pid.ki === Infinity ? null : pid.ki, derivativeTime_s: pid.kd };
  return form === 'ideal' ? idealToParallel(times) : seriesToParallel(times);
}

/**
 * The open loop L = plant × PID (× discrete PID and hold) that `analyseLoop` analyses,
 * as an `OpenLoop` record for analyseOpenLoop. Validates the plant
 * (`verify.invalidLoop` with a JSON path under `plant`).
 */
export function openLoopOf(description: LoopDescription): OpenLoop {
  const { plant } = description;
  checkCoefficients(plant.numerator, 'plant.numerator');
  checkCoefficients(plant.denominator, 'plant.denominator');
  const latency = description.latency_s ?? LOOP_DEFAULTS.latency_s;
  for (const [name, value] of [['plant.delay_s', plant.delay_s], ['latency_s', latency]] as const) {
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
      throw new SpeedbandError('verify.invalidLoop', `${name} is ${String(value)} — expected a finite time ≥ 0 s`, { location: { jsonPath: name }, details: { [name]: value } });
    }
  }
  const gains = parallelGainsOf(description.pid);
  const derivativeFilter = description.pid.derivativeFilter ?? LOOP_DEFAULTS.derivativeFilter;
  const controller = pidTransferFunction(gains, derivativeFilter);
  const delay_s = plant.delay_s + latency;
  if (description.sampleTime_s === undefined) {
    return {
      numerator: multiplyPolynomials(plant.numerator, controller.numerator),
      denominator: multiplyPolynomials(plant.denominator, controller.denominator),
      delay_s,
    };
  }
  const sampleTime_s = description.sampleTime_s;
  if (typeof sampleTime_s !== 'number' || !(sampleTime_s > 0) || !Number.isFinite(sampleTime_s)) {
    throw new SpeedbandError('verify.invalidLoop', `sampleTime_s is ${String(sampleTime_s)} — expected a finite sample time > 0 s, or omit it for a continuous controller`, {
      location: { jsonPath: 'sampleTime_s' },
      details: { sampleTime_s },
    });
  }
  const discrete = discretePidCoefficients(gains, {
    derivativeFilter,
    sampleTime_s,
    discretisation: description.discretisation ?? LOOP_DEFAULTS.discretisation,
    computationLatency_s: latency,
  });
  return {
    numerator: [...plant.numerator],
    denominator: [...plant.denominator],
    delay_s,
    discreteController: {
      numerator: discrete.numerator,
      denominator: discrete.denominator,
      sampleTime_s,
      continuousCounterpart: { numerator: controller.numerator, denominator: controller.denominator },
    },
  };
}

/**
 * Margins and verdict of a plant under a PID (see LoopDescription for the forms and
 * units): `analyseOpenLoop(openLoopOf(description))`. Units: rad/s, degrees, dB, s.
 */
export function analyseLoop(description: LoopDescription): LoopMargins {
  return analyseOpenLoop(openLoopOf(description));
}
