/**
 * The manoeuvres of the time-domain figures as sampled signals at the controller's sample time:
 * the lane change (a fifth-order polynomial in distance, zero slope and curvature at both ends — common
 * practice for test manoeuvres) and the curve entry (a curvature step), both as path geometry the vehicle
 * follows: the measured offset of the preview point from the path is the vehicle's own lateral position
 * minus the path's, so the path enters the loop as a disturbance at its output; the feed-forward reads
 * the path curvature T_ff ahead (src/loops/feed-forward.ts).
 */

/** A path in small-angle form: lateral position p(s) (m) and curvature p''(s) (1/m) at the distance s along it (m). */
export interface PathShape {
  readonly position: (s_m: number) => number;
  readonly curvature: (s_m: number) => number;
}

/** The lane change: p(s) = size·(10q³ − 15q⁴ + 6q⁵), q = s/length on [0, length], held beyond. */
export function laneChangePath(size_m: number, length_m: number): PathShape {
  const clampQ = (s: number): number => Math.min(1, Math.max(0, s / length_m));
  return {
    position: (s) => {
      const q = clampQ(s);
      return size_m * q * q * q * (10 - 15 * q + 6 * q * q);
    },
    curvature: (s) => {
      if (s <= 0 || s >= length_m) return 0;
      const q = s / length_m;
      return (size_m / (length_m * length_m)) * (60 * q - 180 * q * q + 120 * q * q * q);
    },
  };
}

/** The curve entry: straight, then constant curvature κ from s = 0: p(s) = κ·s²/2. */
export function curveEntryPath(curvature_perM: number): PathShape {
  return {
    position: (s) => (s > 0 ? (curvature_perM * s * s) / 2 : 0),
    curvature: (s) => (s > 0 ? curvature_perM : 0),
  };
}

/**
 * The path as the loop sees it over `count` samples: the preview point is at distance s_k = v·(k·Ts − leadIn)
 * along the path (the manoeuvre starts after the lead-in), so the output disturbance is −p(s_k) and the
 * feed-forward input κ(s_k + v·T_ff).
 */
export function sampledPath(shape: PathShape, speed_mps: number, sampleTime_s: number, leadIn_s: number, feedForwardLead_s: number, count: number): { disturbance: Float64Array; curvature: Float64Array } {
  const disturbance = new Float64Array(count);
  const curvature = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const s = speed_mps * (k * sampleTime_s - leadIn_s);
    disturbance[k] = -shape.position(s);
    curvature[k] = shape.curvature(s + speed_mps * feedForwardLead_s);
  }
  return { disturbance, curvature };
}
