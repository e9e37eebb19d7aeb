import type { TransferFunction } from '../lti/types.js';

/** The loop the firmware closes (docs/domain.md §3 "Loops a firmware may close"). */
export type LoopKind = 'yaw-rate' | 'heading' | 'path';

/** Where a path loop's preview distance is measured from: the centre of gravity or the front axle. */
export type ReferencePoint = 'cg' | 'front-axle';

/** Which loop to build: the kind, and for a path loop the preview distance and its reference point. */
export interface LoopSpecification {
  readonly kind: LoopKind;
  /** Path loop only: preview distance ahead of the reference point, m (≥ 0). */
  readonly preview_m?: number;
  /**
   * Path loop only: preview time, s (≥ 0, default 0): the preview grows with speed, d = preview_m + previewTime_s·vx
   * ahead of the reference point (a look-ahead that keeps the same time headway at every speed).
   */
  readonly previewTime_s?: number;
  /** Path loop only: 'cg' (default) or 'front-axle' (distance from the CG = preview + a). */
  readonly referencePoint?: ReferencePoint;
}

/**
 * The plant the firmware's loop sees at one speed: steering command δcmd (rad) → the controlled
 * variable (yaw rate r in rad/s, heading ψ in rad, or lateral offset e in m at the preview point,
 * positive to the left, ISO 8855), including actuator lag and delay, the controller's hold delay
 * Ts/2 and its computation latency (in `plant.delay_s`).
 */
export interface LoopPlant {
  readonly kind: LoopKind;
  /** Path loop: preview distance as given, from `referencePoint`, m. */
  readonly preview_m?: number;
  /** Path loop: preview time as given, s (the preview at this speed is preview_m + previewTime_s·speed_mps). */
  readonly previewTime_s?: number;
  readonly referencePoint?: ReferencePoint;
  /** Path loop: the preview distance measured from the CG, m (the d in e = ey + d·eψ). */
  readonly previewFromCg_m?: number;
  readonly speed_mps: number;
  readonly plant: TransferFunction;
}

/** What a loop definition needs besides the vehicle's own response. */
export interface LoopContext {
  readonly speed_mps: number;
  /** Preview distance from the CG, m (0 for yaw-rate and heading loops). */
  readonly previewFromCg_m: number;
}

/**
 * One loop: how to turn the steer → yaw-rate response (and, for the single-track model, the steer
 * → lateral-velocity response) into the loop plant, and what integrators and gain factor its
 * design model carries. Both responses share one denominator. A new loop is one file exporting a
 * LoopDefinition plus one line in registry.ts.
 */
export interface LoopDefinition {
  readonly kind: LoopKind;
  readonly description: string;
  /** Unit of the controlled variable, for help texts. */
  readonly outputUnit: string;
  /** Units of the parallel gains kp, ki, kd (steer command rad per error, per error·s, per error rate). */
  readonly gainUnits: { readonly kp: string; readonly ki: string; readonly kd: string };
  /** From a steer → yaw-rate transfer function alone (lumped models; lateral velocity neglected). */
  readonly fromYawRate: (yawRate: TransferFunction, context: LoopContext) => TransferFunction;
  /** From the single-track responses (exact: uses lateral velocity too). */
  readonly fromSingleTrack: (
    responses: { readonly yawRate: TransferFunction; readonly lateralVelocity: TransferFunction },
    context: LoopContext,
  ) => TransferFunction;
  /** Integrators the loop adds to the yaw-rate response (0, 1 or 2). */
  readonly integrators: 0 | 1 | 2;
  /** Factor on the yaw-rate gain in the design model (1, or vx for the path loop). */
  readonly designGainFactor: (context: LoopContext) => number;
  /**
   * Lead time constant T0 (s) of the design model's numerator (T0·s + 1); `lateralVelocityPerYawRate_m` is
   * G_vy(0)/G_r(0) from the single-track model (0 for lumped models, which neglect vy). Path loop:
   * (G_vy(0) + d·G_r(0))/(vx·G_r(0)), the low-frequency zero of the exact path plant; other loops 0.
   */
  readonly designLead_s: (context: LoopContext, lateralVelocityPerYawRate_m: number) => number;
}
