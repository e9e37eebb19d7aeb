/**
 * Speed as a function of time for a scenario: constant, then (from `changeStart_s`) a constant acceleration
 * or deceleration to the final speed, then constant again. Distance travelled in closed form.
 */
export interface SpeedProfile {
  readonly initial_mps: number;
  readonly final_mps: number;
  /** When the speed starts to change, s. */
  readonly changeStart_s: number;
  /** Magnitude of the acceleration or deceleration, m/s² (> 0 when initial ≠ final). */
  readonly acceleration_mps2: number;
}

export function constantSpeed(speed_mps: number): SpeedProfile {
  return { initial_mps: speed_mps, final_mps: speed_mps, changeStart_s: 0, acceleration_mps2: 0 };
}

/** True when the speed never changes (the plant is then time-invariant). */
export function isConstantSpeed(profile: SpeedProfile): boolean {
  return profile.initial_mps === profile.final_mps;
}

/** Seconds the speed change lasts. */
export function changeDuration_s(profile: SpeedProfile): number {
  return isConstantSpeed(profile) ? 0 : Math.abs(profile.final_mps - profile.initial_mps) / profile.acceleration_mps2;
}

export function speedAt_mps(profile: SpeedProfile, time_s: number): number {
  const { initial_mps: v0, final_mps: v1 } = profile;
  if (v0 === v1 || time_s <= profile.changeStart_s) return v0;
  const change = Math.sign(v1 - v0) * profile.acceleration_mps2 * (time_s - profile.changeStart_s);
  return Math.abs(change) >= Math.abs(v1 - v0) ? v1 : v0 + change;
}

export function distanceAt_m(profile: SpeedProfile, time_s: number): number {
  const { initial_mps: v0, final_mps: v1, changeStart_s: t0 } = profile;
  if (v0 === v1 || time_s <= t0) return v0 * time_s;
  const rampEnd = t0 + changeDuration_s(profile);
  const within = Math.min(time_s, rampEnd) - t0;
  const ramp = ((v0 + speedAt_mps(profile, t0 + within)) / 2) * within;
  return v0 * t0 + ramp + (time_s > rampEnd ? v1 * (time_s - rampEnd) : 0);
}
