import { describe, expect, it } from 'vitest';
import type { FirmwareSettings } from '../../src/controller/firmware-step.js';
import { loopPlantFromSingleTrack } from '../../src/loops/build.js';
import { simulateClosedLoop } from '../../src/performance/closed-loop-simulation.js';
import { sampledPlant } from '../../src/verify/sampled-plant.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { runPython } from '../helpers/python.js';
import { PARCEL_VAN, PARCEL_VAN_CONTROLLER } from '../helpers/parcel-van.js';

// The demo parcel van (invented numbers),
// with an actuator delay that is not a whole number of samples.
const van: SingleTrackParameters = { ...PARCEL_VAN, actuatorDelay_s: 0.043 };

/**
 * The closed loop built independently in python as one linear state-space system driven by the reference and
 * simulated with scipy.signal.dlsim: the plant discretised with scipy.linalg.expm of the augmented matrix
 * (zero-order hold; the delay split into whole samples and a fraction m, Γ0 over Ts − m and Γ1 over m — the
 * modified z-transform, Franklin, Powell & Workman §4.3.4), a register of past commands, and the two-degree-of-
 * freedom PID (backward Euler, filtered derivative on c·r − y, proportional on b·r − y) as states.
 */
const DLSIM = `
import json, sys, numpy as np
from scipy import signal, linalg
d = json.load(sys.stdin)
a, b = np.array(d['den'], float), np.array(d['num'], float)
A, B, C, D = signal.tf2ss(b / a[0], a / a[0])
n = A.shape[0]; Ts = d['Ts']
ell = int(np.floor(d['delay'] / Ts + 1e-9)); m = d['delay'] - ell * Ts
def zoh(h):
    M = np.zeros((n + 1, n + 1)); M[:n, :n] = A * h; M[:n, n:] = B * h
    E = linalg.expm(M); return E[:n, :n], E[:n, n:]
P1, G0 = zoh(Ts - m); P2, Gm = zoh(m)
Phi = P1 @ P2; G1 = P1 @ Gm
kp, ki, kd, bw, cw, N = d['kp'], d['ki'], d['kd'], d['b'], d['c'], d['N']
Tf = (kd / kp) / N; p = Tf / (Tf + Ts); g = kd / (Tf + Ts)
R = ell + 1
# state z = [x (n), w1..wR (past commands u[k-1..k-R]), I, Dd, dprev]; input r
S = n + R + 3; iI, iD, iP = n + R, n + R + 1, n + R + 2
def row(): return np.zeros(S + 1)   # last entry: coefficient of r
y = row(); y[:n] = C[0]; y[n + R - 1] += D[0, 0]
e = -y.copy(); e[S] += 1
dd = -y.copy(); dd[S] += cw
Inew = row(); Inew[iI] = 1; Inew += Ts * ki * e
Dnew = row(); Dnew[iD] = p; Dnew += g * (dd - np.eye(S + 1)[iP])
u = -kp * y; u[S] += kp * bw; u = u + Inew + Dnew
uk_ell = u if ell == 0 else np.eye(S + 1)[n + ell - 1]
uk_ell1 = np.eye(S + 1)[n + R - 1]
rows = []
for i in range(n):
    r_ = np.zeros(S + 1); r_[:n] = Phi[i]; r_ += G0[i, 0] * uk_ell + G1[i, 0] * uk_ell1; rows.append(r_)
rows.append(u)
for i in range(1, R): rows.append(np.eye(S + 1)[n + i - 1])
rows += [Inew, Dnew, dd]
M = np.array(rows)
Acl, Bcl = M[:, :S], M[:, S:]
Ccl = y[:S].reshape(1, -1); Dcl = np.array([[y[S]]])
r = np.ones(d['count'])
x0 = np.zeros(S); x0[iP] = cw * r[0]
_, out, _ = signal.dlsim((Acl, Bcl, Ccl, Dcl, Ts), r, x0=x0)
print(json.dumps({'y': out[:, 0].tolist()}))
`;

describe('simulateClosedLoop', () => {
  it('gives the reference-step response of scipy.signal.dlsim on the closed loop built in python, to 1e-9 (heading loop, fractional delay)', () => {
    const controller = PARCEL_VAN_CONTROLLER;
    const loop = loopPlantFromSingleTrack({ kind: 'heading' }, van, 8, controller);
    // The loop analysis' plant: vehicle, actuator and latency, without the Ts/2 the design model adds.
    const plant = { ...loop.plant, delay_s: loop.plant.delay_s - controller.sampleTime_s / 2 };
    const gains = { kp: 2.2, ki: 1.9, kd: 0.29, setpointWeightProportional: 0.6, setpointWeightDerivative: 0.3, feedForward: 0 };
    const settings: FirmwareSettings = { ...controller, antiWindup: 'conditional-integration', commandLimit_rad: Infinity, integratorClamp_rad: Infinity };
    const count = 800;
    const ours = simulateClosedLoop({ plant: sampledPlant(plant, controller.sampleTime_s), gains, settings, reference: new Float64Array(count).fill(1) });
    const reference = runPython<{ y: number[] }>(DLSIM, {
      num: plant.numerator,
      den: plant.denominator,
      delay: plant.delay_s,
      Ts: controller.sampleTime_s,
      kp: gains.kp,
      ki: gains.ki,
      kd: gains.kd,
      b: gains.setpointWeightProportional,
      c: gains.setpointWeightDerivative,
      N: controller.derivativeFilter,
      count,
    });
    expect((plant.delay_s / controller.sampleTime_s) % 1).not.toBeCloseTo(0, 3);
    for (let k = 0; k < count; k++) expect(Math.abs(ours.output[k] - reference.y[k])).toBeLessThan(1e-9);
  });
});
