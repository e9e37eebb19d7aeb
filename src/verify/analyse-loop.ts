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
import { analyseOpenLoop, type AnalysisOptions } from './analyse-open-loop.js';
import type { LoopMargins, OpenLoop } from './types.js';
import { checkCoefficients } from './validate-loop.js';

/**
 * A plant and a PID. Plant coefficients highest power first, delay in s.
 * PID fields by `form` (default 'parallel'):
 * - parallel: C = kp + ki/s + kd·s/(1 + Tf·s)                  (kp, ki, kd as PidGains)
 * - ideal:    C = Kc·(1 + 1/(Ti·s) + Td·s/(1 + Tf·s)), read as kp = Kc, ki = Ti (s), kd = Td (s)
 * - series:   C = Kc·(1 + 1/(τI·s))·(1 + τD·s), read as kp = Kc, ki = τI (s), kd = τD (s),
 *             converted to ideal by Kc' = Kc(1 + τD/τI), Ti = τI + τD, Td = τIτD/(τI + τD)
 *             (docs/domain.md §4) and then filtered like the others.
 * For ideal and series forms the times are better given by name: `integralTime_s` (Ti or τI,
 * s; null or Infinity = no integral action) and `derivativeTime_s` (Td or τD, s). When
 * given they are used and `ki`/`kd` are ignored; `ki`/`kd` read as times remain accepted
 * for compatibility (ki = Infinity means no integral action). The parallel form refuses the
 * named times (its ki is 1/s and kd is s: give those).
 * The derivative filter is Tf = Td/N with N = derivativeFilter (default 10, common
 * practice; Infinity = unfiltered — only proper with a plant of relative degree ≥ 1).
 */
export interface LoopDescription {
  readonly plant: { readonly numerator: readonly number[]; readonly denominator: readonly number[]; readonly delay_s: number };
  readonly pid: {
    readonly kp: number;
    /** Parallel: integral gain, 1/s. Ideal/series (compatibility): the integral time, s — prefer integralTime_s. */
    readonly ki?: number;
    /** Parallel: derivative gain, s. Ideal/series (compatibility): the derivative time, s — prefer derivativeTime_s. */
    readonly kd?: number;
    /** Ideal/series only: integral time Ti (ideal) or τI (series), s; null or Infinity = no integral action. */
    readonly integralTime_s?: number | null;
    /** Ideal/series only: derivative time Td (ideal) or τD (series), s. */
    readonly derivativeTime_s?: number;
    readonly derivativeFilter?: number;
    readonly form?: PidForm;
  };
  /** Firmware sample time, s: the controller is then the discrete PID at this rate behind a zero-order hold, analysed exactly as sampled. Omit for a continuous controller. */
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
  if (form !== 'parallel' && form !== 'ideal' && form !== 'series') {
    return badPid(`pid.form is '${String(form)}' — expected 'parallel', 'ideal' or 'series'`, 'pid.form', { form });
  }
  if (form === 'parallel') {
    for (const name of ['integralTime_s', 'derivativeTime_s'] as const) {
      if (pid[name] !== undefined) {
        badPid(
          `pid.${name} is given with the parallel form — the parallel form takes ki (1/s) and kd (s); set form 'ideal' or 'series' to give times`,
          `pid.${name}`,
          { ...pid },
        );
      }
    }
  }
  // Ideal/series: the named times win over ki/kd read as times.
  const integralName = form !== 'parallel' && pid.integralTime_s !== undefined ? 'integralTime_s' : 'ki';
  const derivativeName = form !== 'parallel' && pid.derivativeTime_s !== undefined ? 'derivativeTime_s' : 'kd';
  const integral = integralName === 'ki' ? pid.ki : pid.integralTime_s === null ? Infinity : pid.integralTime_s;
  const derivative = derivativeName === 'kd' ? pid.kd : pid.derivativeTime_s;
  const checks = [
    ['kp', pid.kp, false],
    [integralName, integral, form !== 'parallel'],
    [derivativeName, derivative, false],
  ] as const;
  for (const [name, value, allowInfinite] of checks) {
    if (typeof value !== 'number' || Number.isNaN(value) || (!Number.isFinite(value) && !(allowInfinite && value === Infinity))) {
      const hint =
        form === 'parallel'
          ? ''
          : ` (for the ${form} form give integralTime_s and derivativeTime_s in s${allowInfinite ? '; null or Infinity for no integral action' : ''})`;
      badPid(
        `pid.${name} is ${String(value)} — expected a finite number${allowInfinite && form === 'parallel' ? ' (or Infinity for no integral action)' : ''}${hint}`,
        `pid.${name}`,
        { ...pid },
      );
    }
  }
  const ki = integral as number;
  const kd = derivative as number;
  if (form === 'parallel') return { kp: pid.kp, ki, kd };
  if (!(ki > 0))
    badPid(
      `pid.${integralName} is read as the ${form} integral time and is ${ki} s — expected a time > 0 s, or ${integralName === 'ki' ? 'Infinity' : 'null'} for no integral action`,
      `pid.${integralName}`,
      { ...pid },
    );
  if (!(kd >= 0))
    badPid(`pid.${derivativeName} is read as the ${form} derivative time and is ${kd} s — expected a time ≥ 0 s`, `pid.${derivativeName}`, { ...pid });
  const times = { gain: pid.kp, integralTime_s: ki === Infinity ? null : ki, derivativeTime_s: kd };
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
  for (const [name, value] of [
    ['plant.delay_s', plant.delay_s],
    ['latency_s', latency],
  ] as const) {
    if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
      throw new SpeedbandError('verify.invalidLoop', `${name} is ${String(value)} — expected a finite time ≥ 0 s`, {
        location: { jsonPath: name },
        details: { [name]: value },
      });
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
    throw new SpeedbandError(
      'verify.invalidLoop',
      `sampleTime_s is ${String(sampleTime_s)} — expected a finite sample time > 0 s, or omit it for a continuous controller`,
      {
        location: { jsonPath: 'sampleTime_s' },
        details: { sampleTime_s },
      },
    );
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
 * units): `analyseOpenLoop(openLoopOf(description), options)`. Units: rad/s, degrees, dB, s.
 */
export function analyseLoop(description: LoopDescription, options: AnalysisOptions = {}): LoopMargins {
  return analyseOpenLoop(openLoopOf(description), options);
}
