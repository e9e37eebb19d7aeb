import { describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { loopPlantFromLumped, loopPlantFromSingleTrack } from '../../src/loops/build.js';
import { LOOP_KINDS } from '../../src/loops/registry.js';
import type { LoopKind } from '../../src/loops/types.js';
import { evaluateTransferFunction } from '../../src/lti/transfer-function.js';
import type { ControllerSettings } from '../../src/controller/types.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';

// An invented parcel-van-like vehicle (synthetic demo numbers).
const van: SingleTrackParameters = {
  mass_kg: 3200,
  yawInertia_kgm2: 5200,
  cgToFrontAxle_m: 1.5,
  cgToRearAxle_m: 1.9,
  frontCorneringStiffness_NPerRad: 90000,
  rearCorneringStiffness_NPerRad: 110000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.04,
};
const controller: ControllerSettings = { derivativeFilter: 10, sampleTime_s: 0.02, discretisation: 'backward-euler', computationLatency_s: 0.005 };
const controllerDelay_s = 0.02 / 2 + 0.005;
const frequencies = [0.01, 0.1, 0.5, 1, 2, 5, 10, 30];

interface Response {
  re: number[];
  im: number[];
}

function ours(kind: LoopKind, speed: number, preview: number, referencePoint: 'cg' | 'front-axle'): Response {
  const loop = loopPlantFromSingleTrack({ kind, preview_m: preview, referencePoint }, van, speed, controller);
  const values = frequencies.map((w) => evaluateTransferFunction(loop.plant, w));
  return { re: values.map((v) => v.re), im: values.map((v) => v.im) };
}

describe('loop plants from the single-track model', () => {
  it('match an independent state-space model (vy, r, ψ, ey; e = ey + d·ψ) with actuator and delays, via scipy.signal.ss2tf', () => {
    const cases = [
      { kind: 'yaw-rate', speed: 8, preview: 0, referencePoint: 'cg', distance: 0 },
      { kind: 'heading', speed: 15, preview: 0, referencePoint: 'cg', distance: 0 },
      { kind: 'path', speed: 5, preview: 0, referencePoint: 'cg', distance: 0 },
      { kind: 'path', speed: 12, preview: 4, referencePoint: 'cg', distance: 4 },
      { kind: 'path', speed: 20, preview: 3, referencePoint: 'front-axle', distance: 3 + van.cgToFrontAxle_m },
    ] as const;
    // Source: the single-track state equations (Rajamani 2012 §2.3; docs/domain.md §3) written out here
    // independently, kinematics ėy = vy + vx·ψ, ψ̇ = r on a straight path, scipy.signal.ss2tf/freqs.
    const reference = runPython<Response[]>(
      `
import json, sys, numpy as np
from scipy import signal
d = json.load(sys.stdin)
p = d['vehicle']; w = np.array(d['frequencies'])
m, Iz, a, b, Cf, Cr = p['mass_kg'], p['yawInertia_kgm2'], p['cgToFrontAxle_m'], p['cgToRearAxle_m'], p['frontCorneringStiffness_NPerRad'], p['rearCorneringStiffness_NPerRad']
out = []
for c in d['cases']:
    vx = c['speed']
    A = np.array([[-(Cf+Cr)/(m*vx), -(a*Cf-b*Cr)/(m*vx) - vx, 0, 0],
                  [-(a*Cf-b*Cr)/(Iz*vx), -(a*a*Cf+b*b*Cr)/(Iz*vx), 0, 0],
                  [0, 1, 0, 0],
                  [1, 0, vx, 0]])
    B = np.array([[Cf/m], [a*Cf/Iz], [0], [0]])
    C = {'yaw-rate': [[0, 1, 0, 0]], 'heading': [[0, 0, 1, 0]], 'path': [[0, 0, c['distance'], 1]]}[c['kind']]
    num, den = signal.ss2tf(A, B, np.array(C, float), np.zeros((1, 1)))
    _, h = signal.freqs(num[0], den, worN=w)
    h = h / (1j*w*p['actuatorLag_s'] + 1) * np.exp(-1j*w*(p['actuatorDelay_s'] + d['controllerDelay']))
    out.append({'re': h.real.tolist(), 'im': h.imag.tolist()})
print(json.dumps(out))
`,
      { vehicle: van, frequencies, cases, controllerDelay: controllerDelay_s },
    );
    cases.forEach((c, index) => {
      const found = ours(c.kind, c.speed, c.preview, c.referencePoint);
      frequencies.forEach((_, k) => {
        const scale = Math.hypot(reference[index].re[k], reference[index].im[k]);
        expect(Math.abs(found.re[k] - reference[index].re[k])).toBeLessThan(1e-9 * scale);
        expect(Math.abs(found.im[k] - reference[index].im[k])).toBeLessThan(1e-9 * scale);
      });
    });
  });

  it('records the loop kind, speed, preview and reference point, and the delay θa + Ts/2 + latency', () => {
    const loop = loopPlantFromSingleTrack({ kind: 'path', preview_m: 3, referencePoint: 'front-axle' }, van, 10, controller);
    expect(loop).toMatchObject({ kind: 'path', preview_m: 3, referencePoint: 'front-axle', previewFromCg_m: 4.5, speed_mps: 10 });
    expect(loop.plant.delay_s).toBeCloseTo(0.04 + 0.01 + 0.005, 15);
    expect(loopPlantFromSingleTrack({ kind: 'yaw-rate' }, van, 10, controller)).not.toHaveProperty('referencePoint');
  });
});

describe('loop plants from a lumped FOPDT yaw-rate model', () => {
  const fopdt = { kind: 'fopdt', gain: 3, timeConstant_s: 0.25, deadTime_s: 0.12 } as const;
  it('yaw-rate G_r, heading G_r/s, path G_r(vx + d·s)/s² with delay θ + Ts/2 + latency (docs/domain.md §3)', () => {
    const speed = 9;
    const d = 2.5;
    for (const kind of LOOP_KINDS) {
      const loop = loopPlantFromLumped({ specification: { kind, preview_m: d }, model: fopdt, speed_mps: speed, controller });
      for (const w of frequencies) {
        // Source: docs/domain.md §3 formulas, complex arithmetic written out here.
        const s = { re: 0, im: w };
        const lagRe = 1;
        const lagIm = w * 0.25;
        const lagAbs2 = lagRe * lagRe + lagIm * lagIm;
        let re = (3 * lagRe) / lagAbs2;
        let im = (-3 * lagIm) / lagAbs2;
        const phase = -w * (0.12 + controllerDelay_s);
        [re, im] = [re * Math.cos(phase) - im * Math.sin(phase), re * Math.sin(phase) + im * Math.cos(phase)];
        if (kind === 'heading') [re, im] = [im / w, -re / w];
        if (kind === 'path') {
          const factorRe = speed / -(w * w);
          const factorIm = (d * s.im) / -(w * w);
          [re, im] = [re * factorRe - im * factorIm, re * factorIm + im * factorRe];
        }
        const value = evaluateTransferFunction(loop.plant, w);
        const scale = Math.hypot(re, im);
        expect(Math.hypot(value.re - re, value.im - im)).toBeLessThan(1e-12 * scale);
      }
    }
  });

  it('refuses a front-axle reference without the axle distance and a negative preview', () => {
    expect(() =>
      loopPlantFromLumped({ specification: { kind: 'path', preview_m: 2, referencePoint: 'front-axle' }, model: fopdt, speed_mps: 5, controller }),
    ).toThrow(/CG-to-front-axle distance/);
    expect(() => loopPlantFromLumped({ specification: { kind: 'path', preview_m: -1 }, model: fopdt, speed_mps: 5, controller })).toThrow(
      /expected a finite distance ≥ 0 m/,
    );
    expect(() => loopPlantFromLumped({ specification: { kind: 'yaw-rate' }, model: fopdt, speed_mps: 0, controller })).toThrow(/above 0 m\/s/);
  });
});
