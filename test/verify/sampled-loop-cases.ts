import { makeRandom } from '../../src/core/random.js';

/** One random sampled loop: plant num/den (highest power first) with delay θ, a discrete PID at Ts. */
export interface SampledCase {
  readonly num: number[];
  readonly den: number[];
  readonly theta: number;
  readonly Ts: number;
  readonly kp: number;
  readonly ki: number;
  readonly kd: number;
  readonly N: number;
  readonly method: 'tustin' | 'backward-euler';
}

/**
 * Seeded random sampled loops over six plant kinds (cycled): first order, overdamped second order,
 * integrating, resonant, open-loop unstable (a pole at +1/τ), and a path-like double integrator with a
 * preview lead (τs + 1)/(s²(0.1τs + 1)). Ts log-uniform in 5–100 ms, θ ≤ 0.25 s and ≤ 20 samples;
 * kp·gain log-uniform in [0.1, maxLoopGain], Ti = kp/ki log-uniform in `integralTimeRange_s`.
 */
export function randomSampledLoops(seed: number, count: number, maxLoopGain: number, integralTimeRange_s: readonly [number, number]): SampledCase[] {
  const random = makeRandom(seed);
  const between = (low: number, high: number): number => low + (high - low) * random.uniform();
  const logBetween = (low: number, high: number): number => Math.exp(between(Math.log(low), Math.log(high)));
  const cases: SampledCase[] = [];
  for (let i = 0; i < count; i++) {
    const gain = logBetween(0.3, 4);
    const tau = logBetween(0.1, 2);
    const kind = i % 6;
    const den =
      kind === 0
        ? [tau, 1]
        : kind === 1
          ? [0.3 * tau * tau, 1.3 * tau, 1]
          : kind === 2
            ? [tau, 1, 0]
            : kind === 3
              ? [1 / (tau * tau), (2 * between(0.2, 0.7)) / tau, 1]
              : kind === 4
                ? [tau, -1]
                : [0.1 * tau, 1, 0, 0];
    const Ts = logBetween(0.005, 0.1);
    const theta = Math.min(between(0, 0.25), 20 * Ts);
    const kp = logBetween(0.1, maxLoopGain) / gain;
    const ki = kp / logBetween(integralTimeRange_s[0], integralTimeRange_s[1]);
    const kd = random.uniform() < 0.25 ? 0 : kp * logBetween(0.005, 0.3);
    const N = [5, 10, 20][Math.floor(random.uniform() * 3)];
    cases.push({ num: kind === 5 ? [gain * tau, gain] : [gain], den, theta, Ts, kp, ki, kd, N, method: i % 2 === 0 ? 'tustin' : 'backward-euler' });
  }
  return cases;
}

/**
 * Python shared by the sampled-loop cross-checks (numpy/scipy, independent of our code):
 * `zoh_plant(c)` → (pn, pd, ell): the zero-order-hold equivalent of num/den with delay θ = ell·Ts + m by the
 * modified z-transform, G(z) = [C (zI − Φ)⁻¹ (G0 z + G1) + D] z^-(ell+1) (Franklin, Powell & Workman §4.3.4);
 * `discrete_pid(c)` → (cn, cd, sn, sd, f): C(z) from the continuous PID kp + ki/s + kd·s/(1 + Tf·s), Tf = kd/(kp·N),
 * by substituting s = sn(z)/sd(z) (Tustin or backward Euler); f = sd + Tf·sn is the filter factor (kd ≠ 0);
 * `closed_loop_matrix(c, added, gain)` → the closed-loop state matrix (plant by scipy.linalg.expm of the augmented
 * matrix, the delay register, C(z)·gain by scipy.signal.tf2ss) with `added` seconds of delay, and
 * `largest_pole(c, added, gain)` → the largest |z| of its numpy eigenvalues.
 */
export const PYTHON_SAMPLED_LOOP = `
import json, sys
import numpy as np
from scipy import signal, optimize
from scipy.linalg import expm
pmul, padd = np.polymul, np.polyadd
def zoh_plant(c):
    T = c['Ts']; theta = c['theta']
    ell = int(np.floor(theta / T + 1e-9)); m = theta - ell * T
    if m < 1e-9 * T: m = 0.0
    A, B, C, D = signal.tf2ss(c['num'], c['den'])
    Phi0, G0, _, _, _ = signal.cont2discrete((A, B, C, D), T - m, method='zoh')
    if m > 0:
        _, Gm, _, _, _ = signal.cont2discrete((A, B, C, D), m, method='zoh')
        G1 = Phi0 @ Gm
    else:
        G1 = np.zeros_like(G0)
    Phi = expm(np.array(A, float) * T)
    n0, den = signal.ss2tf(Phi, G0, C, np.zeros((1, 1)))
    n1, _ = signal.ss2tf(Phi, G1, C, np.zeros((1, 1)))
    Dv = float(np.array(D).ravel()[0])
    pn = padd(padd(pmul(n0[0], [1, 0]), n1[0]), Dv * np.asarray(den))
    pd = pmul(den, [1] + [0] * (ell + 1))
    return pn, pd, ell
def discrete_pid(c):
    T = c['Ts']; kp, ki, kd, N = c['kp'], c['ki'], c['kd'], c['N']
    if c['method'] == 'tustin':
        sn, sd = np.array([2.0, -2.0]), np.array([T, T])
    else:
        sn, sd = np.array([1.0, -1.0]), np.array([T, 0.0])
    if kd == 0:
        return padd(kp * sn, ki * sd), sn, sn, sd, None
    Tf = kd / (kp * N)
    f = padd(sd, Tf * sn)
    cn = padd(padd(kp * pmul(sn, f), ki * pmul(sd, f)), kd * pmul(sn, sn))
    return cn, pmul(sn, f), sn, sd, f
_realisations = {}
def _realisations_of(c):
    key = (tuple(c['num']), tuple(c['den']), c['Ts'], c['kp'], c['ki'], c['kd'], c['N'], c['method'])
    if key not in _realisations:
        A, B, C, D = signal.tf2ss(c['num'], c['den'])
        A = np.atleast_2d(np.array(A, float)); n = A.shape[0]
        plant = (A, np.array(B, float).reshape(n, 1), np.array(C, float).reshape(1, n), float(np.ravel(D)[0]))
        cn, cd, _, _, _ = discrete_pid(c)
        Ac, Bc, Cc, Dc = signal.tf2ss(np.asarray(cn, float), np.asarray(cd, float))
        _realisations[key] = (plant, (np.atleast_2d(Ac), np.ravel(Bc), np.ravel(Cc), float(np.ravel(Dc)[0])))
    return _realisations[key]
def closed_loop_matrix(c, added=0.0, gain=1.0):
    """The closed-loop state matrix of plant (zero-order hold with fractional delay, scipy.linalg.expm of the
    augmented matrix), a register of past outputs for the whole samples, and gain·C(z) by scipy.signal.tf2ss."""
    T = c['Ts']; theta = c['theta'] + added
    ell = int(np.floor(theta / T + 1e-9)); m = theta - ell * T
    if m < 1e-9 * T: m = 0.0
    (A, B, C, D), (Ac, Bc, Cc, Dc) = _realisations_of(c)
    n = A.shape[0]
    def zoh(h):
        M = np.zeros((n + 1, n + 1)); M[:n, :n] = A * h; M[:n, n:] = B * h
        E = expm(M)
        return E[:n, :n], E[:n, n:]
    Phi_late, G0 = zoh(T - m)
    if m > 0:
        Phi_early, Gm = zoh(m); Phi = Phi_late @ Phi_early; G1 = Phi_late @ Gm
    else:
        Phi = Phi_late; G1 = np.zeros((n, 1))
    q = Ac.shape[0] if Ac.size else 0
    R = ell + 1; N = n + R + q; ic = n + R
    e = np.zeros(N); e[:n] = -C.ravel(); e[n + R - 1] -= D
    u = gain * Dc * e
    if q: u[ic:ic + q] += gain * Cc
    M = np.zeros((N, N))
    M[:n, :n] = Phi
    if ell == 0: M[:n, :] += G0 @ u.reshape(1, -1)
    else: M[:n, n + ell - 1] += G0.ravel()
    M[:n, n + R - 1] += G1.ravel()
    M[n, :] = u
    for i in range(1, R): M[n + i, n + i - 1] = 1
    if q:
        M[ic:ic + q, ic:ic + q] += Ac
        M[ic:ic + q, :] += Bc.reshape(q, 1) @ e.reshape(1, -1)
    return M
def largest_pole(c, added=0.0, gain=1.0):
    return float(np.max(np.abs(np.linalg.eigvals(closed_loop_matrix(c, added, gain)))))
data = json.load(sys.stdin)
out = []
`;
