/**
 * The linear single-track ("bicycle") model with linear tyres (docs/domain.md §3;
 * Gillespie 1992, Rajamani 2012 ch. 2), as state equations and as transfer
 * functions from road-wheel angle δ (rad) to yaw rate r (rad/s) and lateral
 * velocity vy (m/s) at the centre of gravity.
 *
 * Signs follow ISO 8855: x forward, y left, z up; positive δ steers left and
 * gives positive (counter-clockwise) yaw rate and positive vy at low speed.
 *
 * State equations, states x = [vy, r]:
 *   m(v̇y + vx·r) = Fyf + Fyr,   Iz·ṙ = a·Fyf − b·Fyr,
 *   Fyf = Cf(δ − (vy + a·r)/vx),  Fyr = −Cr(vy − b·r)/vx,
 *   ay = v̇y + vx·r.
 */
import { SpeedbandError } from '../core/errors.js';
import type { TransferFunction } from '../lti/types.js';
import type { SingleTrackParameters, Vehicle } from './types.js';
import { quoted } from '../core/quote.js';

/** Continuous-time state space ẋ = A x + B δ, y = C x + D δ, states [vy, r], outputs [vy, r, ay]. */
export interface SingleTrackStateSpace {
  /** 2×2 system matrix, rows/columns [vy (m/s), r (rad/s)]. */
  readonly A: number[][];
  /** 2×1 input matrix for δ (rad). */
  readonly B: number[][];
  /** 3×2 output matrix, rows [vy (m/s), r (rad/s), ay (m/s²)]. */
  readonly C: number[][];
  /** 3×1 feed-through for δ (only ay has one: Cf/m). */
  readonly D: number[][];
  readonly stateNames: readonly ['lateralVelocity_mps', 'yawRate_radps'];
  readonly outputNames: readonly ['lateralVelocity_mps', 'yawRate_radps', 'lateralAcceleration_mps2'];
}

/** Both transfer functions of the model at one speed, δ (rad) as input, no actuator, delay_s = 0. */
export interface SingleTrackTransferFunctions {
  /** δ → r, (rad/s)/rad: (b1 s + b0)/(s² + a1 s + a0). */
  readonly yawRate: TransferFunction;
  /** δ → vy at the CG, (m/s)/rad: (c1 s + c0)/(s² + a1 s + a0). */
  readonly lateralVelocity: TransferFunction;
}

function requirePositiveSpeed(speed_mps: number): void {
  if (!(Number.isFinite(speed_mps) && speed_mps > 0)) {
    throw new SpeedbandError(
      'vehicle.speedNotPositive',
      `the single-track model needs a forward speed above 0 m/s, got ${speed_mps} — its tyre slip angles divide by speed; use a positive speed_mps`,
      { details: { speed_mps } },
    );
  }
}

/**
 * State space of the single-track model at constant forward speed vx (m/s > 0).
 *   A = [[−(Cf+Cr)/(m vx),        −(a Cf − b Cr)/(m vx) − vx],
 *        [−(a Cf − b Cr)/(Iz vx), −(a² Cf + b² Cr)/(Iz vx)]],
 *   B = [Cf/m, a Cf/Iz]ᵀ;  ay = A[0]·x + vx·r + (Cf/m)·δ.
 * Source: Rajamani 2012, Vehicle Dynamics and Control, §2.3 (written in vy, r).
 */
export function singleTrackStateSpace(params: SingleTrackParameters, speed_mps: number): SingleTrackStateSpace {
  requirePositiveSpeed(speed_mps);
  const { mass_kg: m, yawInertia_kgm2: iz, cgToFrontAxle_m: a, cgToRearAxle_m: b } = params;
  const cf = params.frontCorneringStiffness_NPerRad;
  const cr = params.rearCorneringStiffness_NPerRad;
  const vx = speed_mps;
  const a11 = -(cf + cr) / (m * vx);
  const a12 = -(a * cf - b * cr) / (m * vx) - vx;
  const a21 = -(a * cf - b * cr) / (iz * vx);
  const a22 = -(a * a * cf + b * b * cr) / (iz * vx);
  const bv = cf / m;
  const br = (a * cf) / iz;
  const denominatorTerms = [a11 + a22, a11 * a22 - a12 * a21, a21 * bv - a11 * br, a12 * br - a22 * bv];
  if (![a11, a12, a21, a22, bv, br, ...denominatorTerms].every(Number.isFinite)) {
    throw new SpeedbandError(
      'vehicle.nonFiniteModel',
      `mass ${m} kg, yaw inertia ${iz} kg·m², axle distances ${a} and ${b} m and cornering stiffnesses ${cf} and ${cr} N/rad give a single-track model ` +
        `with non-finite coefficients at ${vx} m/s — check the magnitudes and units of these numbers`,
      { details: { speed_mps: vx } },
    );
  }
  return {
    A: [
      [a11, a12],
      [a21, a22],
    ],
    B: [[bv], [br]],
    C: [
      [1, 0],
      [0, 1],
      [a11, a12 + vx],
    ],
    D: [[0], [0], [bv]],
    stateNames: ['lateralVelocity_mps', 'yawRate_radps'],
    outputNames: ['lateralVelocity_mps', 'yawRate_radps', 'lateralAcceleration_mps2'],
  };
}

/**
 * Transfer functions δ (rad) → r (rad/s) and δ → vy (m/s) at speed vx, without
 * actuator dynamics (delay_s = 0), coefficients highest power first.
 * Denominator s² + a1 s + a0 with (docs/domain.md §3; Gillespie 1992, Rajamani 2012)
 *   a1 = (Cf+Cr)/(m vx) + (a²Cf + b²Cr)/(Iz vx),  a0 = Cf Cr L²/(m Iz vx²) + (b Cr − a Cf)/Iz;
 * yaw rate numerator b1 = a Cf/Iz, b0 = Cf Cr L/(m Iz vx);
 * lateral velocity numerator (from (sI − A)⁻¹B of the same state equations)
 *   c1 = Cf/m,  c0 = Cf Cr b L/(m Iz vx) − a Cf vx/Iz.
 */
export function singleTrackTransferFunctions(params: SingleTrackParameters, speed_mps: number): SingleTrackTransferFunctions {
  const { A, B } = singleTrackStateSpace(params, speed_mps);
  const [[a11, a12], [a21, a22]] = A;
  const bv = B[0][0];
  const br = B[1][0];
  const denominator = [1, -(a11 + a22), a11 * a22 - a12 * a21];
  return {
    yawRate: { numerator: [br, a21 * bv - a11 * br], denominator, delay_s: 0 },
    lateralVelocity: { numerator: [bv, a12 * br - a22 * bv], denominator, delay_s: 0 },
  };
}

/**
 * Steering actuator, command (rad) → road-wheel angle (rad): e^(−θa s)/(τa s + 1),
 * θa = actuatorDelay_s, τa = actuatorLag_s; τa = 0 gives a pure delay (numerator [1], denominator [1]).
 */
export function actuatorTransferFunction(params: SingleTrackParameters): TransferFunction {
  const lag_s = params.actuatorLag_s;
  return {
    numerator: [1],
    denominator: lag_s > 0 ? [lag_s, 1] : [1],
    delay_s: params.actuatorDelay_s,
  };
}

/**
 * Understeer gradient K = (m/L)(b/Cf − a/Cr), rad per m/s² (road-wheel angle per lateral
 * acceleration). K > 0 understeer, K < 0 oversteer. Source: Gillespie 1992, eq. 6-15; Rajamani 2012 §3.
 */
export function understeerGradient_radPerMps2(params: SingleTrackParameters): number {
  const a = params.cgToFrontAxle_m;
  const b = params.cgToRearAxle_m;
  const wheelbase_m = a + b;
  return (params.mass_kg / wheelbase_m) * (b / params.frontCorneringStiffness_NPerRad - a / params.rearCorneringStiffness_NPerRad);
}

/**
 * Steady-state yaw-rate gain r/δ = vx/(L + K vx²), 1/s ((rad/s) per rad of road-wheel angle).
 * Infinite (or negative) at and above the critical speed of an oversteering vehicle, where no
 * stable steady state exists. Source: Gillespie 1992 §6; Rajamani 2012 §3.
 */
export function steadyStateYawGain_perS(params: SingleTrackParameters, speed_mps: number): number {
  requirePositiveSpeed(speed_mps);
  const wheelbase_m = params.cgToFrontAxle_m + params.cgToRearAxle_m;
  return speed_mps / (wheelbase_m + understeerGradient_radPerMps2(params) * speed_mps * speed_mps);
}

/** Characteristic speed √(L/K), m/s, at which the yaw gain peaks (understeer, K > 0); null otherwise. Source: Gillespie 1992 §6. */
export function characteristicSpeed_mps(params: SingleTrackParameters): number | null {
  const k = understeerGradient_radPerMps2(params);
  if (!(k > 0)) return null;
  return Math.sqrt((params.cgToFrontAxle_m + params.cgToRearAxle_m) / k);
}

/** Critical speed √(−L/K), m/s, above which an oversteering vehicle (K < 0) is open-loop unstable; null otherwise. Source: Gillespie 1992 §6. */
export function criticalSpeed_mps(params: SingleTrackParameters): number | null {
  const k = understeerGradient_radPerMps2(params);
  if (!(k < 0)) return null;
  return Math.sqrt(-(params.cgToFrontAxle_m + params.cgToRearAxle_m) / k);
}

/**
 * Single-track parameters of a vehicle file: geometry, mass and inertia, the nominal cornering
 * stiffnesses (N/rad, whole axle) and the actuator lag and delay (s, 0 when absent).
 * Throws `vehicle.noCorneringStiffness` when the file carries no nominal stiffnesses.
 */
export function singleTrackParametersFromVehicle(vehicle: Vehicle): SingleTrackParameters {
  const cf = vehicle.frontCorneringStiffness_NPerRad;
  const cr = vehicle.rearCorneringStiffness_NPerRad;
  if (cf === undefined || cr === undefined) {
    const missing = [cf === undefined ? 'frontCorneringStiffness_NPerRad' : null, cr === undefined ? 'rearCorneringStiffness_NPerRad' : null]
      .filter((name) => name !== null)
      .join(' and ');
    throw new SpeedbandError(
      'vehicle.noCorneringStiffness',
      `vehicle ${quoted(vehicle.name)} has no ${missing} — the single-track model needs nominal whole-axle cornering stiffnesses (N/rad); add them to the vehicle file, or identify them from step-test logs first`,
      { location: { jsonPath: cf === undefined ? '/frontCorneringStiffness_NPerRad' : '/rearCorneringStiffness_NPerRad' }, details: { missing } },
    );
  }
  return {
    mass_kg: vehicle.mass_kg,
    yawInertia_kgm2: vehicle.yawInertia_kgm2,
    cgToFrontAxle_m: vehicle.cgToFrontAxle_m,
    cgToRearAxle_m: vehicle.cgToRearAxle_m,
    frontCorneringStiffness_NPerRad: cf,
    rearCorneringStiffness_NPerRad: cr,
    actuatorLag_s: vehicle.actuatorLag_s ?? 0,
    actuatorDelay_s: vehicle.actuatorDelay_s ?? 0,
  };
}
