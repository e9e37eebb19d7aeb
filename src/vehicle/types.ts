/**
 * A vehicle file (vehicles/<name>/vehicle.json), validated by vehicle/schema.ts.
 * Units in field names, SI. Cornering stiffnesses are identified from logs;
 * a vehicle file may carry nominal ones for the simulator only.
 */
export interface Vehicle {
  readonly name: string;
  readonly description?: string;
  readonly mass_kg: number;
  readonly yawInertia_kgm2: number;
  readonly cgToFrontAxle_m: number;
  readonly cgToRearAxle_m: number;
  /** Steering-wheel angle per road-wheel angle, dimensionless. */
  readonly steeringRatio: number;
  readonly maxSteerAngle_rad: number;
  readonly maxSteerRate_radps: number;
  /** Steering actuator first-order lag (position loop), s. */
  readonly actuatorLag_s?: number;
  /** Steering actuator transport delay, s. */
  readonly actuatorDelay_s?: number;
  /** Firmware controller sample time, s. */
  readonly controllerSampleTime_s?: number;
  /**
   * The acceleration and deceleration the vehicle uses in service (not the most it can do), m/s²: the speed changes
   * through the range that the scenarios judge a schedule by (plan check.rampAcceleration_mps2, check.brakingDeceleration_mps2).
   */
  readonly serviceAcceleration_mps2?: number;
  readonly serviceDeceleration_mps2?: number;
  /** Whole-axle nominal cornering stiffnesses for the simulator, N/rad. */
  readonly frontCorneringStiffness_NPerRad?: number;
  readonly rearCorneringStiffness_NPerRad?: number;
}

/** The physical parameters of the linear single-track model (docs/domain.md §3). */
export interface SingleTrackParameters {
  readonly mass_kg: number;
  readonly yawInertia_kgm2: number;
  readonly cgToFrontAxle_m: number;
  readonly cgToRearAxle_m: number;
  readonly frontCorneringStiffness_NPerRad: number;
  readonly rearCorneringStiffness_NPerRad: number;
  readonly actuatorLag_s: number;
  readonly actuatorDelay_s: number;
}
