/**
 * The words a schedule carries so firmware engineers implement exactly what was checked:
 * units of the gains per loop, the error signal, the controller law and its per-sample update.
 */
import type { Discretisation } from '../controller/types.js';
import type { LoopKind, ReferencePoint } from './plan.js';
import type { InterpolationMethod } from './types.js';
import type { ScheduleUnits } from './schedule-types.js';

/**
 * Units of kp, ki, kd for the loop the firmware closes; the output is the road-wheel angle command, rad.
 * yaw-rate (e in rad/s): kp rad per rad/s, ki rad per rad, kd rad per rad/s²;
 * heading (e in rad): kp rad per rad, ki rad per rad·s, kd rad per rad/s;
 * path (e in m): kp rad per m, ki rad per m·s, kd rad per m/s.
 */
export function gainUnits(kind: LoopKind): ScheduleUnits {
  switch (kind) {
    case 'yaw-rate':
      return { speed: 'm/s', error: 'rad/s', output: 'rad', kp: 'rad per rad/s', ki: 'rad per rad', kd: 'rad per rad/s²' };
    case 'heading':
      return { speed: 'm/s', error: 'rad', output: 'rad', kp: 'rad per rad', ki: 'rad per rad·s', kd: 'rad per rad/s' };
    case 'path':
      return { speed: 'm/s', error: 'm', output: 'rad', kp: 'rad per m', ki: 'rad per m·s', kd: 'rad per m/s' };
  }
}

/** The error the controller acts on (ISO 8855 signs: positive to the left). */
export function loopErrorText(kind: LoopKind, preview_m: number, referencePoint: ReferencePoint): string {
  switch (kind) {
    case 'yaw-rate':
      return 'e = yaw-rate reference − measured yaw rate, rad/s (positive counter-clockwise seen from above, ISO 8855)';
    case 'heading':
      return 'e = heading reference − measured heading, rad (positive counter-clockwise seen from above, ISO 8855)';
    case 'path':
      return `e = lateral offset of the path from the vehicle at ${preview_m} m ahead of the ${
        referencePoint === 'cg' ? 'centre of gravity' : 'front axle'
      }: e = e_y + d·e_ψ with d the preview distance from the centre of gravity, m (positive when the path is to the left, ISO 8855)`;
  }
}

export const CONTROLLER_EQUATION =
  'u = kp·e + ki·∫e dt + kd·s/(1 + Tf·s)·e, Tf = Td/N, Td = kd/kp (gains interpolated at the current speed); ' +
  'u is the road-wheel angle command, rad, positive to the left; N = derivativeFilter';

/**
 * The per-sample update, k = sample index, Ts = sampleTime_s, I clamped to ±integratorClamp_rad.
 * The same equations as src/controller/discrete-step.ts (discretePidStep) and derivativeFilterTime_s.
 */
export function controllerUpdateText(discretisation: Discretisation): string[] {
  const common = [
    'kp[k], ki[k], kd[k] = the gains looked up at the current speed; Tf = kd/(kp·N) (Tf = 0 when kd = 0; Tf = √(kd/ki)/N when kp = 0)',
  ];
  if (discretisation === 'tustin') {
    return [
      ...common,
      'I[k] = clamp(I[k−1] + Ts·(ki[k]·e[k] + ki[k−1]·e[k−1])/2, −integratorClamp_rad, +integratorClamp_rad)',
      'D[k] = ((2·Tf − Ts)·D[k−1] + 2·kd[k]·(e[k] − e[k−1]))/(2·Tf + Ts)   (Tustin; the filter pole (2Tf − Ts)/(2Tf + Ts) nears −1 as Tf → 0)',
      'u[k] = kp[k]·e[k] + I[k] + D[k]',
    ];
  }
  return [
    ...common,
    'I[k] = clamp(I[k−1] + ki[k]·Ts·e[k], −integratorClamp_rad, +integratorClamp_rad)',
    'D[k] = (Tf·D[k−1] + kd[k]·(e[k] − e[k−1]))/(Tf + Ts)   (backward Euler; the filter pole Tf/(Tf + Ts) stays in [0, 1))',
    'u[k] = kp[k]·e[k] + I[k] + D[k]',
  ];
}

export const INTEGRATION_TEXT =
  'The integrator accumulates ki·e·Ts each sample (the current gain inside the sum), not ki times an accumulated ∫e: ' +
  'when ki changes with speed the stored state is unchanged and the output does not jump (bumpless gain changes).';

export function interpolationText(method: InterpolationMethod, lowSpeedFloor_mps: number): string {
  const between =
    method === 'linear'
      ? 'each gain linearly between neighbouring breakpoints'
      : 'each gain by monotone piecewise cubic Hermite interpolation (Fritsch & Carlson 1980; slopes as in the C export)';
  return (
    `Gains: ${between}; exact table values at breakpoints; outside the table the end values are held (clamp); ` +
    `below ${lowSpeedFloor_mps} m/s (low-speed floor) the gains at ${lowSpeedFloor_mps} m/s are used.`
  );
}

/** A check model's kind in words: "joint single-track model", "per-speed models interpolated in speed". */
export function modelWords(kind: string): string {
  return kind === 'interpolated-lumped' ? 'per-speed models interpolated in speed' : kind === 'single-track' ? 'joint single-track model' : `${kind} model`;
}
