/**
 * The words a schedule carries so firmware engineers implement exactly what was checked:
 * units of the gains per loop, the error signal, the controller law and its per-sample update.
 */
import type { AntiWindup } from '../controller/firmware-step.js';
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
      return {
        speed: 'm/s',
        error: 'rad/s',
        output: 'rad',
        kp: 'rad per rad/s',
        ki: 'rad per rad',
        kd: 'rad per rad/s²',
        feedForward: 'rad per rad/s',
        feedForwardInput: 'rad/s (yaw-rate reference)',
      };
    case 'heading':
      return {
        speed: 'm/s',
        error: 'rad',
        output: 'rad',
        kp: 'rad per rad',
        ki: 'rad per rad·s',
        kd: 'rad per rad/s',
        feedForward: 'rad per rad/s',
        feedForwardInput: 'rad/s (yaw-rate reference, the rate of the heading reference)',
      };
    case 'path':
      return {
        speed: 'm/s',
        error: 'm',
        output: 'rad',
        kp: 'rad per m',
        ki: 'rad per m·s',
        kd: 'rad per m/s',
        feedForward: 'rad per 1/m',
        feedForwardInput: '1/m (path curvature, positive turning left)',
      };
  }
}

/** The preview distance in words: "2 m" or "0.5 m + 0.3 s × speed". */
export function previewText(preview_m: number, previewTime_s: number): string {
  return previewTime_s === 0 ? `${preview_m} m` : `${preview_m} m + ${previewTime_s} s × speed`;
}

/** A preview reference point in words: "front axle" or "centre of gravity". */
export const referencePointText = (point: ReferencePoint): string => (point === 'cg' ? 'centre of gravity' : 'front axle');

/** The error the controller acts on (ISO 8855 signs: positive to the left); r and y are the controller's reference and measurement. */
export function loopErrorText(kind: LoopKind, preview_m: number, referencePoint: ReferencePoint, previewTime_s = 0): string {
  switch (kind) {
    case 'yaw-rate':
      return 'e = r − y: r the yaw-rate reference, y the measured yaw rate, rad/s (positive counter-clockwise seen from above, ISO 8855)';
    case 'heading':
      return 'e = r − y: y the measured heading and r the heading reference, both taken from the tangent of the path followed (r = 0 to follow it; with set-point weight b < 1 an absolute heading would make b·r grow without bound along a curve), rad (positive counter-clockwise seen from above, ISO 8855)';
    case 'path':
      return `e = r − y at the preview point ${previewText(preview_m, previewTime_s)} ahead of the ${referencePointText(
        referencePoint,
      )}: y = lateral offset of that point from the path (e_y + d·e_ψ, d the preview distance from the centre of gravity), r = the commanded offset from the path (0 to follow the path itself), m (positive to the left, ISO 8855)`;
  }
}

export const CONTROLLER_EQUATION =
  'u = F + kp·(b·r − y) + ki·∫(r − y) dt + kd·s/(1 + Tf·s)·(c·r − y), Tf = Td/N, Td = kd/kp; F = kff·w the feed-forward; ' +
  'gains, set-point weights b and c and kff interpolated at the current speed; u is the road-wheel angle command, rad, positive to the left, ' +
  'limited to ±integratorClamp_rad; N = derivativeFilter (two-degree-of-freedom PID, Åström & Hägglund 2006, §3.4)';

/** What the feed-forward input w is and when it is read. */
export function feedForwardText(kind: LoopKind): string {
  const lead = 'feedForwardLeadTime_s (T_ff, per breakpoint, interpolated) ahead';
  return kind === 'path'
    ? `F = kff·w, w = the path curvature, 1/m (positive turning left), at the path station the preview point reaches ${lead} — v·T_ff beyond the preview point, behind it when T_ff < 0; kff = L + K·v² (Gillespie 1992; Rajamani 2012) from the identified model`
    : `F = kff·w, w = the yaw-rate reference r_ref (rad/s; for a heading loop the rate of the heading reference) at time t + T_ff, T_ff = ${lead}; kff = (L + K·v²)/v = 1/(steady yaw-rate gain) from the identified model`;
}

/**
 * The per-sample update, k = sample index, Ts = sampleTime_s: the equations of firmwareStep
 * (src/controller/firmware-step.ts) in words.
 */
export function controllerUpdateText(discretisation: Discretisation, antiWindup: AntiWindup = 'conditional-integration'): string[] {
  const lines = [
    'kp[k], ki[k], kd[k], b[k], c[k], kff[k], T_ff[k] = the values looked up at the current speed; Tf = kd/(kp·N) (Tf = 0 when kd = 0; Tf = √(kd/ki)/N when kp = 0)',
    'e[k] = r[k] − y[k];  d[k] = c[k]·r[k] − y[k] (d[−1] = d[0]: no kick on the first sample);  F[k] = kff[k]·w[k]',
    discretisation === 'tustin' ? 'ΔI[k] = Ts·(ki[k]·e[k] + ki[k−1]·e[k−1])/2' : 'ΔI[k] = ki[k]·Ts·e[k]',
  ];
  if (antiWindup === 'back-calculation') {
    lines.push(
      'ΔI[k] += Ts·(u[k−1] − v[k−1])/Tt, Tt = √(Ti·Td) with Ti = kp/ki, Td = kd/kp (Tt = Ti when kd = 0)   (back-calculation, Åström & Hägglund 2006, §3.5)',
    );
  }
  lines.push(
    'I[k] = clamp(I[k−1] + ΔI[k], −integratorClamp_rad − F[k], +integratorClamp_rad − F[k])   (F + I stays within ±integratorClamp_rad: room for the feed-forward)',
    discretisation === 'tustin'
      ? 'D[k] = ((2·Tf − Ts)·D[k−1] + 2·kd[k]·(d[k] − d[k−1]))/(2·Tf + Ts)   (Tustin; the filter pole (2Tf − Ts)/(2Tf + Ts) nears −1 as Tf → 0)'
      : 'D[k] = (Tf·D[k−1] + kd[k]·(d[k] − d[k−1]))/(Tf + Ts)   (backward Euler; the filter pole Tf/(Tf + Ts) stays in [0, 1))',
    'v[k] = F[k] + kp[k]·(b[k]·r[k] − y[k]) + I[k] + D[k]',
  );
  if (antiWindup === 'conditional-integration') {
    lines.push(
      'if |v[k]| > integratorClamp_rad and ΔI[k] has the sign of v[k]: I[k] = clamp(I[k−1], …) and v[k] recomputed   (conditional integration, Åström & Hägglund 2006, §3.5)',
    );
  }
  lines.push('u[k] = clamp(v[k], −integratorClamp_rad, +integratorClamp_rad)   (the same equations as src/controller/firmware-step.ts, firmwareStep)');
  return lines;
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
    `Gains, set-point weights, feed-forward gain and lead time: ${between}; exact table values at breakpoints; outside the table the end values are held (clamp); ` +
    `below ${lowSpeedFloor_mps} m/s (low-speed floor) the gains at ${lowSpeedFloor_mps} m/s are used.`
  );
}

/** A check model's kind in words: "joint single-track model", "per-speed models interpolated in speed". */
export function modelWords(kind: string): string {
  return kind === 'interpolated-lumped' ? 'per-speed models interpolated in speed' : kind === 'single-track' ? 'joint single-track model' : `${kind} model`;
}
