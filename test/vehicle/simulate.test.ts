import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { simulateSingleTrack } from '../../src/vehicle/simulate.js';
import { criticalSpeed_mps } from '../../src/vehicle/single-track.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { runPython } from '../helpers/python.js';

/** Invented test vehicles: an understeering van and an oversteering rear-heavy car. */
const UNDERSTEER: SingleTrackParameters = {
  mass_kg: 3200,
  yawInertia_kgm2: 5400,
  cgToFrontAxle_m: 1.55,
  cgToRearAxle_m: 1.85,
  frontCorneringStiffness_NPerRad: 110_000,
  rearCorneringStiffness_NPerRad: 150_000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.04,
};
const OVERSTEER: SingleTrackParameters = {
  mass_kg: 1400,
  yawInertia_kgm2: 2300,
  cgToFrontAxle_m: 1.6,
  cgToRearAxle_m: 1.0,
  frontCorneringStiffness_NPerRad: 90_000,
  rearCorneringStiffness_NPerRad: 55_000,
  actuatorLag_s: 0.05,
  actuatorDelay_s: 0.02,
};

function uniformTime(period_s: number, count: number): Float64Array {
  return Float64Array.from({ length: count }, (_, k) => k * period_s);
}

/** A seeded command: holds of random length and level, some fast ramps between them. */
function randomCommand(seed: number, count: number, amplitude_rad: number): Float64Array {
  const random = makeRandom(seed);
  const command = new Float64Array(count);
  let level = 0;
  let k = 0;
  while (k < count) {
    const next = amplitude_rad * (2 * random.uniform() - 1);
    const ramp = Math.floor(random.uniform() * 6);
    for (let j = 1; j <= ramp && k < count; j += 1, k += 1) command[k] = level + ((next - level) * j) / (ramp + 1);
    level = next;
    const hold = 5 + Math.floor(random.uniform() * 40);
    for (let j = 0; j < hold && k < count; j += 1, k += 1) command[k] = level;
  }
  return command;
}

describe('simulateSingleTrack: steady state', () => {
  it('settles at the steady-state yaw gain vx/(L + K vx²) for understeer and oversteer below the critical speed', () => {
    const step_rad = 0.01;
    const cases: { params: SingleTrackParameters; speeds: number[] }[] = [
      { params: UNDERSTEER, speeds: [2, 8, 15, 25] },
      { params: OVERSTEER, speeds: [3, 8, 0.8 * criticalSpeed_mps(OVERSTEER)!] },
    ];
    for (const { params, speeds } of cases) {
      const { mass_kg: m, cgToFrontAxle_m: a, cgToRearAxle_m: b } = params;
      const L = a + b;
      // Source: Gillespie 1992 §6 / Rajamani 2012 §3: K = (m/L)(b/Cf − a/Cr), r/δ = vx/(L + K vx²).
      const K = (m / L) * (b / params.frontCorneringStiffness_NPerRad - a / params.rearCorneringStiffness_NPerRad);
      for (const vx of speeds) {
        const time_s = uniformTime(0.02, 3000); // 60 s hold: the slowest mode here decays by far more than 1e-8
        const command = new Float64Array(time_s.length).fill(step_rad);
        const { yawRate_radps, lateralAcceleration_mps2 } = simulateSingleTrack({ params, speed_mps: vx, time_s, steerCommand_rad: command });
        const expected = (vx / (L + K * vx * vx)) * step_rad;
        expect(Math.abs(yawRate_radps[yawRate_radps.length - 1] / expected - 1)).toBeLessThan(1e-8);
        // in the steady state ay = vx·r (docs/domain.md §3 with v̇y = 0)
        expect(Math.abs(lateralAcceleration_mps2[time_s.length - 1] / (vx * expected) - 1)).toBeLessThan(1e-8);
      }
    }
  });
});

describe('simulateSingleTrack agrees with scipy.signal.lsim (zero-order hold)', () => {
  interface Reference {
    r: number[];
    vy: number[];
    ay: number[];
    delta: number[];
  }
  /**
   * Source: scipy.signal.lsim (reference library) with interp=False (zero-order hold) on the
   * state equations written in python from the force balance (docs/domain.md §3) plus the actuator lag
   * state, the delay applied by shifting the input by whole samples of a grid fine enough
   * (`refine` sub-samples per sample) for the delay to be a whole number of them.
   */
  const SCRIPT = `
import json, sys
import numpy as np
from scipy import signal
d = json.load(sys.stdin)
out = []
for c in d:
    p = c['params']; vx = c['speed']
    m, iz, a, b = p['mass_kg'], p['yawInertia_kgm2'], p['cgToFrontAxle_m'], p['cgToRearAxle_m']
    cf, cr, tau, theta = p['frontCorneringStiffness_NPerRad'], p['rearCorneringStiffness_NPerRad'], p['actuatorLag_s'], p['actuatorDelay_s']
    fyf = np.array([-cf/vx, -cf*a/vx, cf])   # over [vy, r, delta]
    fyr = np.array([-cr/vx, cr*b/vx, 0.0])
    vy_dot = (fyf + fyr)/m - np.array([0.0, vx, 0.0])
    r_dot = (a*fyf - b*fyr)/iz
    A = np.array([vy_dot, r_dot, [0.0, 0.0, -1.0/tau]])
    B = np.array([[0.0], [0.0], [1.0/tau]])
    C = np.array([[1.0, 0, 0], [0, 1.0, 0], vy_dot + np.array([0.0, vx, 0.0]), [0, 0, 1.0]])
    D = np.zeros((4, 1))
    T = c['period'] / c['refine']
    u = np.repeat(np.array(c['command']), c['refine'])
    shift = int(round(theta / T))
    assert abs(shift*T - theta) < 1e-12
    u = np.concatenate([np.zeros(shift), u])[:len(u)]
    t = np.arange(len(u)) * T
    _, y, _ = signal.lsim((A, B, C, D), u, t, interp=False)
    y = y[::c['refine']]
    out.append({'vy': y[:, 0].tolist(), 'r': y[:, 1].tolist(), 'ay': y[:, 2].tolist(), 'delta': y[:, 3].tolist()})
print(json.dumps(out))
`;

  it('to 1e-6 relative, with a delay of whole samples and one of 1.5 and 2.25 samples', () => {
    const period_s = 0.02;
    const count = 1500;
    const cases = [
      { name: 'understeer, delay 2 samples', params: { ...UNDERSTEER, actuatorDelay_s: 0.04 }, speed: 12, refine: 1 },
      { name: 'understeer, delay 1.5 samples', params: { ...UNDERSTEER, actuatorDelay_s: 0.03 }, speed: 4, refine: 2 },
      { name: 'oversteer, delay 2.25 samples', params: { ...OVERSTEER, actuatorDelay_s: 0.045 }, speed: 9, refine: 4 },
      { name: 'oversteer above its critical speed (open-loop unstable), no delay', params: { ...OVERSTEER, actuatorDelay_s: 0 }, speed: 20, refine: 1 },
    ].map((c, index) => ({ ...c, command: Array.from(randomCommand(100 + index, count, 0.03)) }));
    const reference = runPython<Reference[]>(
      SCRIPT,
      cases.map((c) => ({ params: c.params, speed: c.speed, period: period_s, refine: c.refine, command: c.command })),
    );
    cases.forEach((c, index) => {
      const ours = simulateSingleTrack({
        params: c.params,
        speed_mps: c.speed,
        time_s: uniformTime(period_s, count),
        steerCommand_rad: Float64Array.from(c.command),
      });
      const ref = reference[index];
      const pairs: [Float64Array, number[]][] = [
        [ours.yawRate_radps, ref.r],
        [ours.lateralVelocity_mps, ref.vy],
        [ours.lateralAcceleration_mps2, ref.ay],
        [ours.steerAngle_rad, ref.delta],
      ];
      for (const [mine, theirs] of pairs) {
        const scale = Math.max(...theirs.map(Math.abs));
        let worst = 0;
        for (let k = 0; k < count; k += 1) worst = Math.max(worst, Math.abs(mine[k] - theirs[k]));
        expect(worst / scale, c.name).toBeLessThan(1e-6);
      }
    });
  });
});

describe('simulateSingleTrack: actuator limits', () => {
  it('never exceeds the angle and rate limits (property, seeded commands and limits)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1_000_000 }),
        fc.double({ min: 0.02, max: 0.5, noNaN: true }),
        fc.double({ min: 0.05, max: 2, noNaN: true }),
        fc.double({ min: 0, max: 0.4, noNaN: true }),
        fc.double({ min: 0, max: 0.1, noNaN: true }),
        (seed, maxAngle, maxRate, lag, delay) => {
          const period_s = 0.01;
          const time_s = uniformTime(period_s, 400);
          const command = randomCommand(seed, time_s.length, 2 * maxAngle);
          const { steerAngle_rad } = simulateSingleTrack({
            params: { ...UNDERSTEER, actuatorLag_s: lag, actuatorDelay_s: delay },
            speed_mps: 6,
            time_s,
            steerCommand_rad: command,
            maxSteerAngle_rad: maxAngle,
            maxSteerRate_radps: maxRate,
          });
          // The largest angle and the largest change per sample, checked once per run (not once per sample).
          let largestAngle = 0;
          let largestStep = 0;
          for (let k = 0; k < steerAngle_rad.length; k += 1) {
            largestAngle = Math.max(largestAngle, Math.abs(steerAngle_rad[k]));
            if (k > 0) largestStep = Math.max(largestStep, Math.abs(steerAngle_rad[k] - steerAngle_rad[k - 1]));
          }
          expect(largestAngle).toBeLessThanOrEqual(maxAngle * (1 + 1e-12));
          expect(largestStep).toBeLessThanOrEqual(maxRate * period_s * (1 + 1e-9));
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });

  it('follows the closed-form rate-limited lag response to a large step', () => {
    // Source: textbook solution of δ̇ = sat((c − δ)/τ, R): a ramp at R until c − δ = Rτ,
    // reached at t1 = (c − Rτ)/R, then δ = c − Rτ·e^(−(t − t1)/τ).
    const lag = 0.1;
    const rate = 0.5;
    const target = 0.2;
    const time_s = uniformTime(0.01, 200);
    const command = new Float64Array(time_s.length).fill(target);
    const { steerAngle_rad } = simulateSingleTrack({
      params: { ...UNDERSTEER, actuatorLag_s: lag, actuatorDelay_s: 0 },
      speed_mps: 5,
      time_s,
      steerCommand_rad: command,
      maxSteerRate_radps: rate,
    });
    const t1 = (target - rate * lag) / rate;
    for (let k = 0; k < time_s.length; k += 1) {
      const t = time_s[k];
      const expected = t <= t1 ? rate * t : target - rate * lag * Math.exp(-(t - t1) / lag);
      expect(steerAngle_rad[k]).toBeCloseTo(expected, 12);
    }
  });

  it('with no lag, ramps at the rate limit to the clamped command', () => {
    const time_s = uniformTime(0.01, 100);
    const command = new Float64Array(time_s.length).fill(1);
    const { steerAngle_rad } = simulateSingleTrack({
      params: { ...UNDERSTEER, actuatorLag_s: 0, actuatorDelay_s: 0.05 },
      speed_mps: 5,
      time_s,
      steerCommand_rad: command,
      maxSteerAngle_rad: 0.3,
      maxSteerRate_radps: 1,
    });
    // the delayed command reaches the wheel at 0.05 s, then δ = (t − 0.05)·1 rad/s up to 0.3 rad
    time_s.forEach((t, k) => expect(steerAngle_rad[k]).toBeCloseTo(Math.min(0.3, Math.max(0, t - 0.05)), 12));
  });
});

describe('simulateSingleTrack: bad input', () => {
  const base = { params: UNDERSTEER, speed_mps: 5, time_s: uniformTime(0.01, 10), steerCommand_rad: new Float64Array(10) };
  it('refuses non-uniform time, mismatched lengths and non-finite commands', () => {
    const code = expect.objectContaining({ code: 'simulate.invalidInput' });
    const uneven = Float64Array.from(base.time_s);
    uneven[5] += 0.003;
    expect(() => simulateSingleTrack({ ...base, time_s: uneven })).toThrow(code);
    expect(() => simulateSingleTrack({ ...base, steerCommand_rad: new Float64Array(9) })).toThrow(code);
    const broken = new Float64Array(10);
    broken[3] = NaN;
    expect(() => simulateSingleTrack({ ...base, steerCommand_rad: broken })).toThrow(code);
    expect(() => simulateSingleTrack({ ...base, maxSteerRate_radps: 0 })).toThrow(code);
  });
  it('refuses a speed of 0', () => {
    expect(() => simulateSingleTrack({ ...base, speed_mps: 0 })).toThrow(expect.objectContaining({ code: 'vehicle.speedNotPositive' }));
  });
});
