/**
 * Unit conversions, in one place. Inside the program everything is SI
 * (rad, rad/s, m/s, m, s, kg); conversions happen at the edges only.
 */
export const DEGREES_PER_RADIAN = 180 / Math.PI;
export const RADIANS_PER_DEGREE = Math.PI / 180;
export const MPS_PER_KPH = 1 / 3.6;
/** International mile (1609.344 m) per hour, in m/s. */
export const MPS_PER_MPH = 1609.344 / 3600;

export const degreesToRadians = (angle_deg: number): number => angle_deg * RADIANS_PER_DEGREE;
export const radiansToDegrees = (angle_rad: number): number => angle_rad * DEGREES_PER_RADIAN;
export const kphToMps = (speed_kph: number): number => speed_kph * MPS_PER_KPH;
export const mphToMps = (speed_mph: number): number => speed_mph * MPS_PER_MPH;

/** Amplitude ratio to decibels: 20·log10(ratio). */
export const ratioToDecibels = (ratio: number): number => 20 * Math.log10(ratio);
/** Decibels to amplitude ratio: 10^(dB/20). */
export const decibelsToRatio = (gain_dB: number): number => Math.pow(10, gain_dB / 20);
/** Milliseconds per second is a definition (SI prefix milli = 10⁻³). */
export const SECONDS_PER_MILLISECOND = 1e-3;
/** Standard acceleration of gravity g_n, m/s² (exact by definition, 3rd CGPM 1901): the "g" accelerometers report in. */
export const STANDARD_GRAVITY_MPS2 = 9.80665;
