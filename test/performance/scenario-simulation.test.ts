import { describe, expect, it } from 'vitest';
import { simulateScenario } from '../../src/performance/scenario-simulation.js';
import { runPython } from '../helpers/python.js';
import { constantController, LINEAR_SETTINGS, quietSetup, VAN, VAN_FOR_PYTHON, vanVehicle } from './scenario-helpers.js';

/**
 * The path loop built independently in python: the single-track model with path-relative error states written
 * from Rajamani 2012, Vehicle Dynamics and Control (§2.3 lateral dynamics, §2.5 error dynamics with respect to
 * the road), the actuator lag as a state, discretised with scipy.linalg.expm of the augmented matrix
 * (zero-order hold; the delay split into whole samples and a fraction m — the modified z-transform, Franklin,
 * Powell & Workman, Digital Control of Dynamic Systems, §4.3.4), a register of past commands and the
 * two-degree-of-freedom PID (backward Euler, filtered derivative) as states, closed as one linear system and
 * simulated with scipy.signal.dlsim. Inputs: the reference, a road-wheel misalignment and a lateral force.
 */
const PATH_LOOP_DLSIM = `
import json, sys, numpy as np
from scipy import signal, linalg
d = json.load(sys.stdin)
m_, Iz, a, b, Cf, Cr, tau, v, dprev_ = d['m'], d['Iz'], d['a'], d['b'], d['Cf'], d['Cr'], d['tau'], d['v'], d['preview']
# states [vy, r, e_psi, e_y, delta]; inputs [command, misalignment, force]
A = np.zeros((5, 5)); B = np.zeros((5, 3))
A[0, 0] = -(Cf + Cr) / (m_ * v); A[0, 1] = (b * Cr - a * Cf) / (m_ * v) - v; A[0, 4] = Cf / m_
A[1, 0] = (b * Cr - a * Cf) / (Iz * v); A[1, 1] = -(a * a * Cf + b * b * Cr) / (Iz * v); A[1, 4] = a * Cf / Iz
B[0, 1] = Cf / m_; B[1, 1] = a * Cf / Iz; B[0, 2] = 1 / m_
A[2, 1] = 1; A[3, 0] = 1; A[3, 2] = v
A[4, 4] = -1 / tau; B[4, 0] = 1 / tau
Cy = np.array([0, 0, dprev_, 1, 0.0])
n = 5; Ts = d['Ts']
ell = int(np.floor(d['delay'] / Ts + 1e-9)); mm = d['delay'] - ell * Ts
def zoh(h):
    M = np.zeros((n + 3, n + 3)); M[:n, :n] = A * h; M[:n, n:] = B * h
    E = linalg.expm(M); return E[:n, :n], E[:n, n:]
P1, G0 = zoh(Ts - mm); P2, Gm = zoh(mm)
Phi = P1 @ P2
Gc0 = G0[:, 0]; Gc1 = (P1 @ Gm)[:, 0]
Gd = P1 @ Gm[:, 1:] + G0[:, 1:]          # misalignment and force, held over the sample
kp, ki, kd, bw, cw, N = d['kp'], d['ki'], d['kd'], d['bw'], d['cw'], d['N']
Tf = (kd / kp) / N; p = Tf / (Tf + Ts); g = kd / (Tf + Ts)
R = ell + 1
S = n + R + 3; iI, iD, iP = n + R, n + R + 1, n + R + 2
NI = 3  # exogenous: r, misalignment, force
def row(): return np.zeros(S + NI)
E_ = np.eye(S + NI)
y = row(); y[:n] = Cy
e = -y.copy(); e[S] += 1
dd = -y.copy(); dd[S] += cw
Inew = row(); Inew[iI] = 1; Inew += Ts * ki * e
Dnew = row(); Dnew[iD] = p; Dnew += g * (dd - E_[iP])
u = -kp * y; u[S] += kp * bw; u = u + Inew + Dnew
uk_ell = u if ell == 0 else E_[n + ell - 1]
uk_ell1 = E_[n + R - 1]
rows = []
for i in range(n):
    r_ = np.zeros(S + NI); r_[:n] = Phi[i]; r_ += Gc0[i] * uk_ell + Gc1[i] * uk_ell1
    r_[S + 1] += Gd[i, 0]; r_[S + 2] += Gd[i, 1]
    rows.append(r_)
rows.append(u)
for i in range(1, R): rows.append(E_[n + i - 1])
rows += [Inew, Dnew, dd]
M = np.array(rows)
Acl, Bcl = M[:, :S], M[:, S:]
Ccl = np.vstack([y[:S], u[:S]]); Dcl = np.vstack([y[S:], u[S:]])
U = np.array(d['inputs'])
x0 = np.zeros(S); x0[3] = d['offset']; x0[iP] = cw * U[0, 0] - Cy @ x0[:n]
_, out, _ = signal.dlsim((Acl, Bcl, Ccl, Dcl, Ts), U, x0=x0)
print(json.dumps({'y': out[:, 0].tolist(), 'u': out[:, 1].tolist()}))
`;

describe('simulateScenario at constant speed, no limit reached', () => {
  it('equals scipy.signal.dlsim on the exact zero-order-hold path loop built in python, to 1e-9 (reference step, misalignment, lateral force, initial offset)', () => {
    const speed = 9;
    const preview = 2.5;
    const gains = { kp: 0.19, ki: 0.19, kd: 0.05, setpointWeightProportional: 0.63, setpointWeightDerivative: 0.2 };
    const controller = constantController({ kind: 'path', preview_m: preview, referencePoint: 'cg' }, gains);
    const setup = {
      ...quietSetup(speed, 20),
      referenceStep: { time_s: 1, size: 0.05 },
      misalignment: { time_s: 4, size: 0.002 },
      lateralForce: { time_s: 8, size: 800 },
      initialLateralOffset_m: 0.02,
    };
    const ours = simulateScenario({ vehicle: vanVehicle(), controller, setup, stepsPerSample: 1 });
    expect(ours.integrator.name).toBe('exact');
    const ts = LINEAR_SETTINGS.sampleTime_s;
    const inputs = Array.from(ours.time_s, (t) => [t >= 1 ? 0.05 : 0, t >= 4 ? 0.002 : 0, t >= 8 ? 800 : 0]);
    const reference = runPython<{ y: number[]; u: number[] }>(PATH_LOOP_DLSIM, {
      ...VAN_FOR_PYTHON,
      v: speed,
      preview,
      Ts: ts,
      delay: VAN.actuatorDelay_s + LINEAR_SETTINGS.computationLatency_s,
      N: LINEAR_SETTINGS.derivativeFilter,
      kp: gains.kp,
      ki: gains.ki,
      kd: gains.kd,
      bw: gains.setpointWeightProportional,
      cw: gains.setpointWeightDerivative,
      inputs,
      offset: 0.02,
    });
    const scale = Math.max(...reference.y.map(Math.abs));
    const commandScale = Math.max(...reference.u.map(Math.abs));
    let worst = 0;
    let worstCommand = 0;
    for (let k = 0; k < ours.time_s.length; k++) {
      worst = Math.max(worst, Math.abs(ours.measurement[k] - reference.y[k]));
      worstCommand = Math.max(worstCommand, Math.abs(ours.command_rad[k] - reference.u[k]));
    }
    // Source: scipy.signal.dlsim of the independently built closed loop; tolerance 1e-9 of the largest value.
    expect(worst).toBeLessThan(1e-9 * scale);
    expect(worstCommand).toBeLessThan(1e-9 * commandScale);
    expect(scale).toBeGreaterThan(0.01);
  });
});
