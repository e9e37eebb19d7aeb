/**
 * The manoeuvres of the time-domain figures as sampled signals at the controller's sample time:
 * the lane change (a fifth-order polynomial in distance, zero slope and curvature at both ends — common
 * practice for test manoeuvres) and the curve entry (a curvature step), both as path geometry the vehicle
 * follows: the measured offset of the preview point from the path is the vehicle's own lateral position
 * minus the path's, so the path enters the loop as a disturbance at its output; the feed-forward reads
 * the path curvature T_ff ahead (src/loops/feed-forward.ts).
 */

/**
 * A path in small-angle form at the distance s along it (m): lateral position p(s) (m), heading p'(s) (rad),
 * curvature p''(s) (1/m), and how far the path at s + d lies beside its tangent at s,
 * p(s + d) − p(s) − d·p'(s) (m) — what a preview point d ahead sees on a curving path.
 */
export interface PathShape {
  readonly position: (s_m: number) => number;
  readonly heading: (s_m: number) => number;
  readonly curvature: (s_m: number) => number;
  readonly offsetAhead: (s_m: number, ahead_m: number) => number;
}

/** A path from its position and slope, the offset ahead computed from them. */
function pathFrom(position: (s: number) => number, heading: (s: number) => number, curvature: (s: number) => number): PathShape {
  return { position, heading, curvature, offsetAhead: (s, d) => position(s + d) - position(s) - d * heading(s) };
}

/** The lane change: p(s) = size·(10q³ − 15q⁴ + 6q⁵), q = s/length on [0, length], held beyond. */
export function laneChangePath(size_m: number, length_m: number): PathShape {
  const clampQ = (s: number): number => Math.min(1, Math.max(0, s / length_m));
  return pathFrom(
    (s) => {
      const q = clampQ(s);
      return size_m * q * q * q * (10 - 15 * q + 6 * q * q);
    },
    (s) => {
      const q = clampQ(s);
      return (size_m / length_m) * 30 * q * q * (1 - q) * (1 - q);
    },
    (s) => {
      if (s <= 0 || s >= length_m) return 0;
      const q = s / length_m;
      return (size_m / (length_m * length_m)) * (60 * q - 180 * q * q + 120 * q * q * q);
    },
  );
}

/**
 * The curve entry: straight, then constant curvature κ from s = 0: p(s) = κ·s²/2. The offset ahead is
 * κ·(d − max(0, −s))²/2 for d beyond the entry, in closed form (no cancellation far into the curve).
 */
export function curveEntryPath(curvature_perM: number): PathShape {
  return {
    position: (s) => (s > 0 ? (curvature_perM * s * s) / 2 : 0),
    heading: (s) => (s > 0 ? curvature_perM * s : 0),
    curvature: (s) => (s > 0 ? curvature_perM : 0),
    offsetAhead: (s, d) => {
      const inCurve = Math.max(0, Math.min(d, s + d));
      return (curvature_perM * inCurve * inCurve) / 2;
    },
  };
}

/** A straight path: p(s) = 0. */
export const STRAIGHT_PATH: PathShape = { position: () => 0, heading: () => 0, curvature: () => 0, offsetAhead: () => 0 };

/** A path driven at constant speed, sampled as the loop sees it (sampledPath). */
export interface PathSampling {
  /** The path: position, heading and curvature along its length s. */
  readonly shape: PathShape;
  /** The constant speed, m/s. */
  readonly speed_mps: number;
  /** The controller's sample time Ts, s. */
  readonly sampleTime_s: number;
  /** Time driven before the manoeuvre starts (s = 0), s. */
  readonly leadIn_s: number;
  /** How far ahead in time the feed-forward reads the curvature (T_ff), s. */
  readonly feedForwardLead_s: number;
  /** Number of samples. */
  readonly count: number;
}

/**
 * The path as the loop sees it over `count` samples: the preview point is at distance s_k = v·(k·Ts − leadIn)
 * along the path (the manoeuvre starts after the lead-in), so the output disturbance is −p(s_k) and the
 * feed-forward input κ(s_k + v·T_ff).
 */
export function sampledPath(input: PathSampling): { disturbance: Float64Array; curvature: Float64Array } {
  const { shape, speed_mps, sampleTime_s, leadIn_s, feedForwardLead_s, count } = input;
  const disturbance = new Float64Array(count);
  const curvature = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const s = speed_mps * (k * sampleTime_s - leadIn_s);
    disturbance[k] = -shape.position(s);
    curvature[k] = shape.curvature(s + speed_mps * feedForwardLead_s);
  }
  return { disturbance, curvature };
}
