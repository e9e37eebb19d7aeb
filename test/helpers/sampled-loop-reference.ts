import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { runPython } from './python.js';

/**
 * Margins of the sampled single-track yaw-rate loop computed independently in python (numpy/scipy), from the
 * textbook formulas: the single-track δ→r transfer function (Gillespie 1992; Rajamani 2012, Vehicle Dynamics and
 * Control, §2.3), the actuator e^(−θa s)/(τa s + 1), the backward-Euler PID with filter Tf = (kd/kp)/N, and the
 * plant's exact zero-order-hold equivalent by scipy.signal.cont2discrete (zoh) with the delay θ = ℓT + m by the
 * modified z-transform (Franklin, Powell & Workman, Digital Control of Dynamic Systems, 3rd ed., §4.3.4):
 * G(z) = [C(zI − Φ)⁻¹(Γ0z + Γ1) + D]·z^−(ℓ+1). Phase margin = the smallest 180° + ∠L (wrapped into (−180°, 180°])
 * over the gain crossovers, gain margin = the smallest upper one, Ms refined around the grid peak.
 */
export interface SingleTrackLoopCase extends SingleTrackParameters {
  /** Sample time, derivative filter N and computation latency of the controller. */
  readonly T: number;
  readonly N: number;
  readonly latency: number;
  readonly breakpoints: readonly { readonly speed_mps: number; readonly kp: number; readonly ki: number; readonly kd: number }[];
}

const SCRIPT = `
import sys, json, numpy as np
from scipy import signal, optimize
from scipy.linalg import expm
d = json.load(sys.stdin)
m, Iz, a, b = d['mass_kg'], d['yawInertia_kgm2'], d['cgToFrontAxle_m'], d['cgToRearAxle_m']
Cf, Cr, lag, delay = d['frontCorneringStiffness_NPerRad'], d['rearCorneringStiffness_NPerRad'], d['actuatorLag_s'], d['actuatorDelay_s']
T, N, latency = d['T'], d['N'], d['latency']
out = []
for bp in d['breakpoints']:
    vx, kp, ki, kd = bp['speed_mps'], bp['kp'], bp['ki'], bp['kd']
    L = a + b
    a1 = (Cf + Cr) / (m * vx) + (a*a*Cf + b*b*Cr) / (Iz * vx)
    a0 = Cf*Cr*L*L / (m*Iz*vx*vx) + (b*Cr - a*Cf) / Iz
    b1 = a*Cf/Iz; b0 = Cf*Cr*L/(m*Iz*vx)
    def C(w):
        z = np.exp(1j*w*T)
        q = (1 - 1/z) / T                     # backward Euler: s -> (1 - z^-1)/T
        c = kp + ki / q
        if kd != 0:
            Tf = (kd/kp)/N
            c = c + kd*q/(1 + Tf*q)
        return c
    num = [b1, b0]; den = np.polymul([1, a1, a0], [lag, 1])
    theta = delay + latency
    ell = int(np.floor(theta / T + 1e-9)); frac = theta - ell * T
    if frac < 1e-9 * T: frac = 0.0
    A, B, Cm, D = signal.tf2ss(num, den)
    Phi0, G0, _, _, _ = signal.cont2discrete((A, B, Cm, D), T - frac, method='zoh')
    G1 = Phi0 @ signal.cont2discrete((A, B, Cm, D), frac, method='zoh')[1] if frac > 0 else np.zeros_like(G0)
    Phi = expm(np.array(A, float) * T)
    n0, dz = signal.ss2tf(Phi, G0, Cm, np.zeros((1, 1)))
    n1, _ = signal.ss2tf(Phi, G1, Cm, np.zeros((1, 1)))
    pn = np.polyadd(np.polyadd(np.polymul(n0[0], [1, 0]), n1[0]), float(np.array(D).ravel()[0]) * np.asarray(dz))
    def Lw(w):
        z = np.exp(1j*w*T)
        G = np.polyval(pn, z) / (np.polyval(dz, z) * z**(ell + 1))
        return C(w)*G
    w = np.logspace(-3, np.log10(np.pi/T), 200000)
    Lv = Lw(w)
    mag = np.abs(Lv)
    pms = []
    for i in np.nonzero(np.diff(np.sign(mag - 1)))[0]:
        wc = optimize.brentq(lambda x: abs(Lw(x)) - 1, w[i], w[i+1], xtol=1e-14)
        ph = np.degrees(np.angle(Lw(wc)))
        pm = 180 + ph
        pm = (pm + 180) % 360 - 180
        pms.append(pm)
    gms = []
    im = Lv.imag
    for i in np.nonzero(np.diff(np.sign(im)))[0]:
        if Lv.real[i] < 0:
            wp = optimize.brentq(lambda x: Lw(x).imag, w[i], w[i+1], xtol=1e-14)
            val = Lw(wp)
            if val.real < 0 and abs(val) < 1:
                gms.append(-20*np.log10(abs(val)))
    end = Lw(np.pi/T)   # real at the Nyquist frequency: negative is a crossing of the negative real axis there
    if end.real < 0 and abs(end) < 1: gms.append(-20*np.log10(abs(end)))
    S = np.abs(1/(1 + Lv))
    k = int(np.argmax(S))
    lo, hi = w[max(k-1, 0)], w[min(k+1, len(w)-1)]
    r = optimize.minimize_scalar(lambda x: -abs(1/(1 + Lw(x))), bounds=(lo, hi), method='bounded', options={'xatol': 1e-12})
    out.append({'pm': min(pms) if pms else None, 'gm': min(gms) if gms else None, 'ms': float(-r.fun)})
print(json.dumps(out))
`;

/** Phase margin (°), upper gain margin (dB) and Ms at each of `input.breakpoints`, from python (see above). */
export function sampledSingleTrackMarginsInPython(input: SingleTrackLoopCase): { pm: number | null; gm: number | null; ms: number }[] {
  return runPython<{ pm: number | null; gm: number | null; ms: number }[]>(SCRIPT, input);
}
