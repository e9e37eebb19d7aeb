import { describe, expect, it } from 'vitest';
import type { PreparedScenario } from '../../src/performance/scenario-catalogue.js';
import { scenarioMetrics } from '../../src/performance/scenario-metrics.js';
import { runScenario } from '../../src/performance/scenario-run.js';
import { simulateScenario } from '../../src/performance/scenario-simulation.js';
import { understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';
import { runPython } from '../helpers/python.js';
import { constantController, LINEAR_SETTINGS, quietSetup, VAN, VAN_FOR_PYTHON, vanVehicle } from './scenario-helpers.js';

const MISALIGNMENT_RAD = 0.004;

function misalignmentRun(loop: 'heading' | 'path' | 'yaw-rate', gains: { kp: number; ki: number; kd: number }, speed_mps: number): Float64Array {
  const controller = constantController(loop === 'path' ? { kind: 'path', preview_m: 3, referencePoint: 'cg' } : { kind: loop }, gains);
  return simulateScenario({
    vehicle: vanVehicle(),
    controller,
    setup: { ...quietSetup(speed_mps, 80), misalignment: { time_s: 1, size: MISALIGNMENT_RAD } },
    stepsPerSample: 1,
  }).error;
}

describe('a constant steering misalignment b', () => {
  // Source: the final value theorem, e(∞) = lim s→0 s·E(s) (Franklin, Powell & Emami-Naeini, Feedback Control of
  // Dynamic Systems, ch. 3 and §4.2 on steady-state error and system type): at rest the wheels must point straight
  // (r = 0, vy = 0 in the single-track model), so a PD controller's command must cancel b.
  it('leaves the offset −b/kp under PD in a heading loop (integrating plant: the heading error holds the command)', () => {
    const error = misalignmentRun('heading', { kp: 2.19, ki: 0, kd: 0.29 }, 9);
    expect(error[error.length - 1]).toBeCloseTo(-MISALIGNMENT_RAD / 2.19, 9);
  });

  it('leaves the offset −b/kp under PD in a path loop (the preview point settles beside the path)', () => {
    const error = misalignmentRun('path', { kp: 0.19, ki: 0, kd: 0.05 }, 9);
    expect(error[error.length - 1]).toBeCloseTo(-MISALIGNMENT_RAD / 0.19, 8);
  });

  it('leaves the yaw-rate error −Gr(0)·b/(1 + kp·Gr(0)) under P in a yaw-rate loop, Gr(0) = v/(L + K·v²) (Gillespie 1992, ch. 6)', () => {
    const speed = 9;
    const wheelbase = VAN.cgToFrontAxle_m + VAN.cgToRearAxle_m;
    const yawGain = speed / (wheelbase + understeerGradient_radPerMps2(VAN) * speed * speed);
    const error = misalignmentRun('yaw-rate', { kp: 0.3, ki: 0, kd: 0 }, speed);
    expect(error[error.length - 1]).toBeCloseTo((-yawGain * MISALIGNMENT_RAD) / (1 + 0.3 * yawGain), 10);
  });

  it('is removed by PID in each loop (the integrator holds the cancelling command)', () => {
    for (const [loop, gains] of [
      ['heading', { kp: 2.19, ki: 1.99, kd: 0.29 }],
      ['path', { kp: 0.19, ki: 0.19, kd: 0.05 }],
      ['yaw-rate', { kp: 0.3, ki: 1.94, kd: 0 }],
    ] as const) {
      const error = misalignmentRun(loop, gains, 9);
      const peak = Math.max(...error.map(Math.abs));
      expect(peak, loop).toBeGreaterThan(0);
      expect(Math.abs(error[error.length - 1]), loop).toBeLessThan(1e-6 * peak);
    }
  });
});

describe('a slow speed ramp', () => {
  it('at 0.01 m/s² reproduces the frozen-speed step metrics at the speed it passes (heading loop, small step)', () => {
    const controller = constantController({ kind: 'heading' }, { kp: 2.19, ki: 1.99, kd: 0.29, setpointWeightProportional: 0.6 });
    const step = (speed: PreparedScenario['setup']['speed']): PreparedScenario => ({
      name: 'small-step',
      kind: 'step',
      size: 0.01,
      judgeFrom_s: 1,
      setup: { ...quietSetup(8, 25), speed, referenceStep: { time_s: 1, size: 0.01 } },
    });
    const ramp = runScenario({
      vehicle: vanVehicle(),
      controller,
      scenario: step({ initial_mps: 8, final_mps: 9, changeStart_s: 0, acceleration_mps2: 0.01 }),
    });
    expect(ramp.traces.integrator.name).toBe('runge-kutta-4');
    expect(ramp.converged).toBe(true);
    // Frozen at the speed the ramp has when the step comes (t = 1 s: 8.01 m/s).
    const frozen = runScenario({
      vehicle: vanVehicle(),
      controller,
      scenario: step({ initial_mps: 8.01, final_mps: 8.01, changeStart_s: 0, acceleration_mps2: 0 }),
    });
    expect(frozen.traces.integrator.name).toBe('exact');
    const r = ramp.metrics;
    const f = frozen.metrics;
    // Source: the frozen-speed (exact) run; our tolerances: 1 % on the figures, one sample on the settling time.
    expect(r.overshoot_pct!).toBeGreaterThan(1);
    expect(Math.abs(r.overshoot_pct! - f.overshoot_pct!)).toBeLessThan(0.01 * f.overshoot_pct!);
    expect(Math.abs(r.settlingTime_s! - f.settlingTime_s!)).toBeLessThanOrEqual(LINEAR_SETTINGS.sampleTime_s + 1e-12);
    expect(Math.abs(r.peakSteerAngle_rad - f.peakSteerAngle_rad)).toBeLessThan(0.01 * f.peakSteerAngle_rad);
    expect(Math.abs(r.peakLateralAcceleration_mps2 - f.peakLateralAcceleration_mps2)).toBeLessThan(0.01 * f.peakLateralAcceleration_mps2);
  });
});

/**
 * Describing-function prediction of a saturating heading loop's limit cycle: harmonic balance
 * 1 + N(V)·kp·G(jω) = 0 with the saturation's describing function for an input of amplitude V,
 * N(V) = (2/π)·[asin(a/V) + (a/V)·√(1 − (a/V)²)] (Gelb & Vander Velde 1968, Multiple-Input Describing Functions
 * and Nonlinear System Design, ch. 2; Slotine & Li 1991, Applied Nonlinear Control, §5.3), G the heading plant
 * (single-track model written from Rajamani 2012 §2.3, actuator lag) with the delay θ of actuator, latency and
 * the hold (Ts/2). ω: arg G(jω) = −π; V: N(V) = 1/(kp·|G(jω)|); heading amplitude V/kp.
 */
const DESCRIBING_FUNCTION = `
import json, sys, numpy as np
from scipy import signal, optimize
d = json.load(sys.stdin)
m_, Iz, a, b, Cf, Cr, tau, v = d['m'], d['Iz'], d['a'], d['b'], d['Cf'], d['Cr'], d['tau'], d['v']
A = np.array([[-(Cf + Cr) / (m_ * v), (b * Cr - a * Cf) / (m_ * v) - v], [(b * Cr - a * Cf) / (Iz * v), -(a * a * Cf + b * b * Cr) / (Iz * v)]])
B = np.array([[Cf / m_], [a * Cf / Iz]])
num, den = signal.ss2tf(A, B, np.array([[0, 1.0]]), np.array([[0.0]]))
vehicle = lambda w: np.polyval(num[0], 1j * w) / np.polyval(den, 1j * w)
G = lambda w: vehicle(w) / (1j * w) / (1j * tau * w + 1) * np.exp(-1j * d['theta'] * w)
# The vehicle's own phase stays within (−π, π/2): add the integrator, the lag and the delay by hand (no wrapping).
phase = lambda w: np.angle(vehicle(w)) - np.pi / 2 - np.arctan(tau * w) - d['theta'] * w + np.pi
w180 = optimize.brentq(phase, 0.1, 50)
target = 1 / (d['kp'] * abs(G(w180)))
lim = d['limit']
N = lambda V: (2 / np.pi) * (np.arcsin(lim / V) + (lim / V) * np.sqrt(1 - (lim / V) ** 2)) - target
V = optimize.brentq(N, lim * (1 + 1e-12), lim * 1e6)
print(json.dumps({'amplitude': V / d['kp'], 'period': 2 * np.pi / w180, 'target': target}))
`;

describe('the limit-cycle detector', () => {
  const speed = 10;
  const limit = 0.03;
  const settings = { ...LINEAR_SETTINGS, commandLimit_rad: limit, integratorClamp_rad: limit };
  const run = (kp: number) =>
    runScenario({
      vehicle: vanVehicle({ maxSteerAngle_rad: limit }),
      controller: constantController({ kind: 'heading' }, { kp }, settings),
      scenario: {
        name: 'initial-offset',
        kind: 'disturbance',
        size: 0.05,
        judgeFrom_s: 0,
        setup: { ...quietSetup(speed, 40), initialHeadingError_rad: 0.05 },
      },
    });

  it("fires on a saturating heading loop, with the describing function's amplitude and period within 20 %", () => {
    const kp = 12;
    const predicted = runPython<{ amplitude: number; period: number; target: number }>(DESCRIBING_FUNCTION, {
      ...VAN_FOR_PYTHON,
      v: speed,
      theta: VAN.actuatorDelay_s + LINEAR_SETTINGS.computationLatency_s + LINEAR_SETTINGS.sampleTime_s / 2,
      kp,
      limit,
    });
    expect(predicted.target).toBeLessThan(1); // the linear loop is unstable: a limit cycle exists
    const cycle = run(kp).metrics.limitCycle;
    expect(cycle).not.toBeNull();
    expect(Math.abs(cycle!.amplitude - predicted.amplitude)).toBeLessThan(0.2 * predicted.amplitude);
    expect(Math.abs(cycle!.period_s - predicted.period)).toBeLessThan(0.2 * predicted.period);
  });

  it('is silent on the same loop with a gain that leaves it well damped', () => {
    const metrics = run(1.5).metrics;
    expect(metrics.limitCycle).toBeNull();
    expect(metrics.settlingTime_s).not.toBeNull();
  });

  it('is silent on a step that decays to rest (metrics of a simulated run with no limit reached)', () => {
    const controller = constantController({ kind: 'heading' }, { kp: 2.19, ki: 1.99, kd: 0.29 });
    const scenario: PreparedScenario = {
      name: 'small-step',
      kind: 'step',
      size: 0.01,
      judgeFrom_s: 1,
      setup: { ...quietSetup(9, 30), referenceStep: { time_s: 1, size: 0.01 } },
    };
    expect(scenarioMetrics(scenario, simulateScenario({ vehicle: vanVehicle(), controller, setup: scenario.setup, stepsPerSample: 1 })).limitCycle).toBeNull();
  });
});

describe('stopping at rest (judging only)', () => {
  it("leaves every figure of the catalogue's scenarios as the full run gives it (heading loop with limits, 4 and 12 m/s)", async () => {
    const { prepareScenario, SCENARIO_NAMES } = await import('../../src/performance/scenario-catalogue.js');
    const { metricsThatMoved } = await import('../../src/performance/scenario-run.js');
    const settings = { ...LINEAR_SETTINGS, commandLimit_rad: 0.6, integratorClamp_rad: 0.6 };
    const controller = constantController(
      { kind: 'heading' },
      { kp: 2.2, ki: 2, kd: 0.29, setpointWeightProportional: 0.6, feedForward: 0.45 },
      settings,
      0.25,
    );
    const vehicle = vanVehicle({ maxSteerAngle_rad: 0.6, maxSteerRate_radps: 0.5 });
    const context = { loop: 'heading' as const, parameters: VAN, maxSteerAngle_rad: 0.6, range: { minimum_mps: 4, maximum_mps: 12 } };
    let shortened = 0;
    for (const name of SCENARIO_NAMES) {
      for (const speed of [4, 12]) {
        const scenario = prepareScenario(name, context, speed);
        if (scenario === null) continue;
        const full = runScenario({ vehicle, controller, scenario });
        const stopped = runScenario({ vehicle, controller, scenario, stopAtRest: true });
        // Every figure within 0.1 % (times within a sample); the final error within 1e-6 of the peak (it is ≈ 0 at rest).
        expect(
          metricsThatMoved(full.metrics, stopped.metrics, LINEAR_SETTINGS.sampleTime_s).filter((key) => key !== 'finalError'),
          `${name} ${speed}`,
        ).toEqual([]);
        expect(Math.abs(full.metrics.finalError - stopped.metrics.finalError)).toBeLessThanOrEqual(1e-6 * full.metrics.peakError);
        if (stopped.traces.steerRate_radps.at(-1) === 0 && full.traces.steerRate_radps.at(-1) !== 0) shortened++;
      }
    }
    expect(shortened).toBeGreaterThan(0);
  });
});
