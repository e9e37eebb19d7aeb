import { describe, expect, it } from 'vitest';
import { EXACT_PIECE_STORE, exactAtSpeed } from '../../src/performance/exact-pieces.js';
import { runPython } from '../helpers/python.js';
import { VAN, VAN_FOR_PYTHON } from './scenario-helpers.js';

/**
 * The path-frame vehicle written out independently (Rajamani 2012, Vehicle Dynamics and Control, §2.3 lateral
 * dynamics, §2.5 error dynamics with respect to the road; the actuator's rate as input 'free', or its lag 'track'),
 * discretised by scipy.linalg.expm of the augmented matrix [[A, B], [0, 0]]·h (zero-order hold; Åström &
 * Wittenmark, Computer-Controlled Systems, §2.3).
 */
const EXACT_PIECE_EXPM = `
import json, sys, numpy as np
from scipy import linalg
d = json.load(sys.stdin)
m_, Iz, a, b, Cf, Cr, tau, v, h = d['m'], d['Iz'], d['a'], d['b'], d['Cf'], d['Cr'], d['tau'], d['v'], d['h']
A = np.zeros((5, 5)); B = np.zeros((5, 4))   # states [vy, r, e_psi, e_y, delta]; inputs [w, curvature, force, misalignment]
A[0, 0] = -(Cf + Cr) / (m_ * v); A[0, 1] = (b * Cr - a * Cf) / (m_ * v) - v; A[0, 4] = Cf / m_
A[1, 0] = (b * Cr - a * Cf) / (Iz * v); A[1, 1] = -(a * a * Cf + b * b * Cr) / (Iz * v); A[1, 4] = a * Cf / Iz
B[0, 3] = Cf / m_; B[1, 3] = a * Cf / Iz; B[0, 2] = 1 / m_
A[2, 1] = 1; B[2, 1] = -v
A[3, 0] = 1; A[3, 2] = v
if d['kind'] == 'track':
    A[4, 4] = -1 / tau; B[4, 0] = 1 / tau
else:
    B[4, 0] = 1
M = np.zeros((9, 9)); M[:5, :5] = A * h; M[:5, 5:] = B * h
E = linalg.expm(M)
print(json.dumps({'phi': E[:5, :5].ravel().tolist(), 'gamma': E[:5, 5:].ravel().tolist()}))
`;

describe('exact pieces of the path-frame vehicle', () => {
  for (const [kind, speed_mps, h] of [
    ['track', 12, 0.01],
    ['free', 3, 0.0043],
    ['track', 25, 0.0057],
  ] as const) {
    it(`${kind} piece of ${h} s at ${speed_mps} m/s: Φ and Γ match scipy.linalg.expm of the augmented matrix`, () => {
      // Source: scipy.linalg.expm (Al-Mohy & Higham 2009) on the same model written independently.
      const expected = runPython<{ phi: number[]; gamma: number[] }>(EXACT_PIECE_EXPM, { ...VAN_FOR_PYTHON, v: speed_mps, h, kind });
      const piece = exactAtSpeed(VAN, speed_mps, VAN.actuatorLag_s).piece(kind, h);
      const scale = Math.max(...expected.phi.map(Math.abs), ...expected.gamma.map(Math.abs));
      [...piece.phi].forEach((value, i) => expect(Math.abs(value - expected.phi[i])).toBeLessThan(1e-12 * scale));
      [...piece.gamma].forEach((value, i) => expect(Math.abs(value - expected.gamma[i])).toBeLessThan(1e-12 * scale));
    });
  }

  it('is kept: the same model numbers, speed and lag give the same pieces (another object with equal numbers too); another speed or model does not', () => {
    const first = exactAtSpeed(VAN, 7, VAN.actuatorLag_s);
    const piece = first.piece('track', 0.01);
    expect(exactAtSpeed({ ...VAN }, 7, VAN.actuatorLag_s).piece('track', 0.01)).toBe(piece);
    expect(first.piece('track', 0.01)).toBe(piece);
    expect(exactAtSpeed(VAN, 7.5, VAN.actuatorLag_s).piece('track', 0.01)).not.toBe(piece);
    const heavier = exactAtSpeed({ ...VAN, mass_kg: VAN.mass_kg * 1.2 }, 7, VAN.actuatorLag_s).piece('track', 0.01);
    expect(heavier).not.toBe(piece);
    expect(heavier.phi[0]).not.toBe(piece.phi[0]);
  });

  it('stays bounded: past the bound the oldest speed is dropped and computed afresh, to the same numbers', () => {
    const piece = exactAtSpeed(VAN, 9, VAN.actuatorLag_s).piece('free', 0.01);
    for (let k = 0; k < EXACT_PIECE_STORE.speeds; k++) exactAtSpeed(VAN, 100 + k, VAN.actuatorLag_s);
    const again = exactAtSpeed(VAN, 9, VAN.actuatorLag_s).piece('free', 0.01);
    expect(again).not.toBe(piece);
    expect([...again.phi]).toEqual([...piece.phi]);
    expect([...again.gamma]).toEqual([...piece.gamma]);
  });
});
