import { describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import {
  actuatorTransferFunction,
  characteristicSpeed_mps,
  criticalSpeed_mps,
  singleTrackParametersFromVehicle,
  singleTrackStateSpace,
  singleTrackTransferFunctions,
  steadyStateYawGain_perS,
  understeerGradient_radPerMps2,
} from '../../src/vehicle/single-track.js';
import type { SingleTrackParameters, Vehicle } from '../../src/vehicle/types.js';
import { SpeedbandError } from '../../src/core/errors.js';

/** A mid-size car-like test vehicle, understeering (b/Cf > a/Cr). Invented for the test. */
const UNDERSTEER: SingleTrackParameters = {
  mass_kg: 1500,
  yawInertia_kgm2: 2500,
  cgToFrontAxle_m: 1.2,
  cgToRearAxle_m: 1.5,
  frontCorneringStiffness_NPerRad: 80_000,
  rearCorneringStiffness_NPerRad: 90_000,
  actuatorLag_s: 0.05,
  actuatorDelay_s: 0.03,
};

/** Oversteering: a rear-heavy vehicle with soft rear tyres. Invented for the test. */
const OVERSTEER: SingleTrackParameters = {
  ...UNDERSTEER,
  cgToFrontAxle_m: 1.6,
  cgToRearAxle_m: 1.1,
  frontCorneringStiffness_NPerRad: 90_000,
  rearCorneringStiffness_NPerRad: 60_000,
};

const RELATIVE = 1e-12; // floating-point agreement of algebraically equal formulas

/** The coefficients written out as in the textbook (docs/domain.md §3; Rajamani 2012 §2.3, Gillespie 1992 §6). */
function textbookYawRate(p: SingleTrackParameters, vx: number) {
  const { mass_kg: m, yawInertia_kgm2: iz, cgToFrontAxle_m: a, cgToRearAxle_m: b } = p;
  const cf = p.frontCorneringStiffness_NPerRad;
  const cr = p.rearCorneringStiffness_NPerRad;
  const L = a + b;
  return {
    a1: (cf + cr) / (m * vx) + (a * a * cf + b * b * cr) / (iz * vx),
    a0: (cf * cr * L * L) / (m * iz * vx * vx) + (b * cr - a * cf) / iz,
    b1: (a * cf) / iz,
    b0: (cf * cr * L) / (m * iz * vx),
  };
}

describe('singleTrackTransferFunctions(params, speed_mps)', () => {
  it('gives the textbook yaw-rate coefficients at several speeds', () => {
    for (const p of [UNDERSTEER, OVERSTEER]) {
      for (const vx of [1, 5, 12.5, 30]) {
        const { yawRate } = singleTrackTransferFunctions(p, vx);
        const t = textbookYawRate(p, vx);
        expect(yawRate.delay_s).toBe(0);
        expect(yawRate.denominator[0]).toBe(1);
        expect(yawRate.denominator[1]).toBeCloseTo(t.a1, 10);
        expect(Math.abs(yawRate.denominator[2] - t.a0)).toBeLessThan(RELATIVE * Math.max(1, Math.abs(t.a0)) * 10);
        expect(Math.abs(yawRate.numerator[0] - t.b1)).toBeLessThan(RELATIVE * t.b1);
        expect(Math.abs(yawRate.numerator[1] - t.b0)).toBeLessThan(RELATIVE * t.b0 * 10);
      }
    }
  });

  it('agrees with scipy.signal.ss2tf on the state equations, for both outputs', () => {
    const speeds = [2, 8, 20];
    const cases = speeds.map((vx) => ({ vx, ss: singleTrackStateSpace(UNDERSTEER, vx), tf: singleTrackTransferFunctions(UNDERSTEER, vx) }));
    // Source: scipy.signal.ss2tf (reference library) on the state equations written directly from
    // the force balance m(v̇y + vx r) = Fyf + Fyr, Iz ṙ = a Fyf − b Fyr (docs/domain.md §3), independent of our A, B.
    const reference = runPython<{ num: number[][]; den: number[] }[]>(
      `
import json, sys
import numpy as np
from scipy import signal
d = json.load(sys.stdin)
p = d['p']
m, iz, a, b, cf, cr = p['mass_kg'], p['yawInertia_kgm2'], p['cgToFrontAxle_m'], p['cgToRearAxle_m'], p['frontCorneringStiffness_NPerRad'], p['rearCorneringStiffness_NPerRad']
out = []
for vx in d['speeds']:
    # Fyf = cf*(delta - (vy + a r)/vx), Fyr = -cr*(vy - b r)/vx, written as rows over [vy, r, delta]
    fyf = np.array([-cf/vx, -cf*a/vx, cf])
    fyr = np.array([-cr/vx, cr*b/vx, 0.0])
    vy_dot = (fyf + fyr)/m - np.array([0.0, vx, 0.0])
    r_dot = (a*fyf - b*fyr)/iz
    A = np.array([vy_dot[:2], r_dot[:2]])
    B = np.array([[vy_dot[2]], [r_dot[2]]])
    C = np.eye(2)
    D = np.zeros((2, 1))
    num, den = signal.ss2tf(A, B, C, D)
    out.append({'num': num.tolist(), 'den': den.tolist()})
print(json.dumps(out))
`,
      { p: UNDERSTEER, speeds },
    );
    cases.forEach(({ tf }, i) => {
      const ref = reference[i];
      const close = (ours: readonly number[], theirs: number[]) => {
        const tail = theirs.slice(theirs.length - ours.length);
        ours.forEach((value, k) => expect(Math.abs(value - tail[k])).toBeLessThan(1e-9 * Math.max(1, Math.abs(tail[k]))));
      };
      close(tf.yawRate.denominator, ref.den);
      close(tf.lateralVelocity.numerator, ref.num[0]);
      close(tf.yawRate.numerator, ref.num[1]);
    });
  });

  it('refuses a speed of zero with a typed error', () => {
    expect(() => singleTrackTransferFunctions(UNDERSTEER, 0)).toThrow(SpeedbandError);
    expect(() => singleTrackTransferFunctions(UNDERSTEER, -1)).toThrow(expect.objectContaining({ code: 'vehicle.speedNotPositive' }));
  });
});

describe('understeer gradient and speeds', () => {
  it('understeerGradient_radPerMps2 is (m/L)(b/Cf − a/Cr) and its sign tells understeer from oversteer', () => {
    // Source: Gillespie 1992, Fundamentals of Vehicle Dynamics, eq. 6-15 (K in rad per m/s²).
    const k = understeerGradient_radPerMps2(UNDERSTEER);
    expect(k).toBeCloseTo((1500 / 2.7) * (1.5 / 80_000 - 1.2 / 90_000), 14);
    expect(k).toBeGreaterThan(0);
    expect(understeerGradient_radPerMps2(OVERSTEER)).toBeLessThan(0);
  });

  it('steady-state yaw gain equals b0/a0 of the transfer function, i.e. vx/(L + K vx²)', () => {
    // Source: Gillespie 1992 §6, r/δ = V/(L + K V²).
    for (const p of [UNDERSTEER, OVERSTEER]) {
      for (const vx of [2, 6, 14]) {
        const { yawRate } = singleTrackTransferFunctions(p, vx);
        const dc = yawRate.numerator[1] / yawRate.denominator[2];
        expect(steadyStateYawGain_perS(p, vx)).toBeCloseTo(dc, 10);
      }
    }
  });

  it('yaw gain peaks at the characteristic speed √(L/K) for an understeering vehicle', () => {
    // Source: Gillespie 1992 §6 — the characteristic speed maximises r/δ.
    const vch = characteristicSpeed_mps(UNDERSTEER)!;
    expect(vch).toBeCloseTo(Math.sqrt(2.7 / understeerGradient_radPerMps2(UNDERSTEER)), 12);
    const peak = steadyStateYawGain_perS(UNDERSTEER, vch);
    expect(peak).toBeGreaterThan(steadyStateYawGain_perS(UNDERSTEER, vch * 0.95));
    expect(peak).toBeGreaterThan(steadyStateYawGain_perS(UNDERSTEER, vch * 1.05));
    // r/δ at vch = vch/(2L) (substitute K = L/vch²).
    expect(peak).toBeCloseTo(vch / (2 * 2.7), 12);
    expect(criticalSpeed_mps(UNDERSTEER)).toBeNull();
  });

  it('the oversteering vehicle becomes open-loop unstable exactly at the critical speed √(−L/K)', () => {
    // Source: Gillespie 1992 §6 / Rajamani 2012 §3: a0 changes sign at the critical speed.
    const vcrit = criticalSpeed_mps(OVERSTEER)!;
    expect(characteristicSpeed_mps(OVERSTEER)).toBeNull();
    const below = singleTrackTransferFunctions(OVERSTEER, vcrit * 0.99).yawRate.denominator[2];
    const above = singleTrackTransferFunctions(OVERSTEER, vcrit * 1.01).yawRate.denominator[2];
    expect(below).toBeGreaterThan(0);
    expect(above).toBeLessThan(0);
  });
});

describe('singleTrackStateSpace(params, speed_mps)', () => {
  it('gives ay = v̇y + vx·r through C and D', () => {
    const vx = 10;
    const { A, B, C, D } = singleTrackStateSpace(UNDERSTEER, vx);
    const x = [0.3, -0.05];
    const delta = 0.02;
    const vyDot = A[0][0] * x[0] + A[0][1] * x[1] + B[0][0] * delta;
    const ay = C[2][0] * x[0] + C[2][1] * x[1] + D[2][0] * delta;
    // Source: docs/domain.md §3, ay = v̇y + vx·r.
    expect(ay).toBeCloseTo(vyDot + vx * x[1], 12);
  });
});

describe('actuatorTransferFunction(params)', () => {
  it('is e^(−θa s)/(τa s + 1), and a pure delay when τa = 0', () => {
    expect(actuatorTransferFunction(UNDERSTEER)).toEqual({ numerator: [1], denominator: [0.05, 1], delay_s: 0.03 });
    expect(actuatorTransferFunction({ ...UNDERSTEER, actuatorLag_s: 0 })).toEqual({ numerator: [1], denominator: [1], delay_s: 0.03 });
  });
});

describe('singleTrackParametersFromVehicle(vehicle)', () => {
  const vehicle: Vehicle = {
    name: 'test',
    mass_kg: 1500,
    yawInertia_kgm2: 2500,
    cgToFrontAxle_m: 1.2,
    cgToRearAxle_m: 1.5,
    steeringRatio: 16,
    maxSteerAngle_rad: 0.6,
    maxSteerRate_radps: 1,
  };

  it('names the missing stiffness in a typed error', () => {
    try {
      singleTrackParametersFromVehicle(vehicle);
      expect.unreachable();
    } catch (error) {
      expect((error as SpeedbandError).code).toBe('vehicle.noCorneringStiffness');
      expect((error as Error).message).toMatch(/frontCorneringStiffness_NPerRad and rearCorneringStiffness_NPerRad/);
    }
  });

  it('defaults absent actuator lag and delay to 0 s', () => {
    const p = singleTrackParametersFromVehicle({ ...vehicle, frontCorneringStiffness_NPerRad: 1, rearCorneringStiffness_NPerRad: 2 });
    expect(p.actuatorLag_s).toBe(0);
    expect(p.actuatorDelay_s).toBe(0);
    expect(p.frontCorneringStiffness_NPerRad).toBe(1);
  });
});
