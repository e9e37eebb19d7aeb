import { describe, expect, it } from 'vitest';
import { discretePidStep, initialDiscretePidState } from '../../src/controller/discrete-step.js';
import { firmwareStep, initialFirmwareState, trackingTime_s, type FirmwareGains, type FirmwareSettings } from '../../src/controller/firmware-step.js';
import type { Discretisation } from '../../src/controller/types.js';
import { makeRandom } from '../../src/core/random.js';

const linear = (discretisation: Discretisation): FirmwareSettings => ({
  derivativeFilter: 10,
  sampleTime_s: 0.01,
  discretisation,
  computationLatency_s: 0,
  antiWindup: 'conditional-integration',
  commandLimit_rad: Number.POSITIVE_INFINITY,
  integratorClamp_rad: Number.POSITIVE_INFINITY,
});
const oneDof = (kp: number, ki: number, kd: number): FirmwareGains => ({
  kp,
  ki,
  kd,
  setpointWeightProportional: 1,
  setpointWeightDerivative: 1,
  feedForward: 0,
});

describe('firmwareStep', () => {
  it('with b = c = 1, no feed-forward and no limit reached is the one-degree-of-freedom discrete PID (discretePidStep) on e = r − y', () => {
    // Property over seeded random gains, references and measurements, both discretisations.
    const random = makeRandom(13).uniform;
    for (const discretisation of ['backward-euler', 'tustin'] as const) {
      for (let trial = 0; trial < 20; trial++) {
        const gains = { kp: 0.1 + 3 * random(), ki: 2 * random(), kd: 0.5 * random() };
        let a = initialFirmwareState();
        let b = initialDiscretePidState();
        for (let k = 0; k < 200; k++) {
          const r = Math.sin(0.05 * k) + random() - 0.5;
          const y = Math.cos(0.03 * k) + random() - 0.5;
          const ours = firmwareStep(oneDof(gains.kp, gains.ki, gains.kd), linear(discretisation), a, { reference: r, measurement: y, feedForwardInput: 0 });
          const reference = discretePidStep(gains, linear(discretisation), b, r - y);
          expect(ours.command).toBeCloseTo(reference.output, 12);
          a = ours.state;
          b = reference.state;
        }
      }
    }
  });

  it('adds the feed-forward kff·w and keeps F + I within ±integratorClamp_rad (room for the feed-forward)', () => {
    const settings: FirmwareSettings = { ...linear('backward-euler'), integratorClamp_rad: 0.5, commandLimit_rad: 10 };
    const gains: FirmwareGains = { kp: 0, ki: 5, kd: 0, setpointWeightProportional: 1, setpointWeightDerivative: 0, feedForward: 2 };
    let state = initialFirmwareState();
    let command = 0;
    for (let k = 0; k < 1000; k++) {
      const step = firmwareStep(gains, settings, state, { reference: 1, measurement: 0, feedForwardInput: 0.1 });
      state = step.state;
      command = step.command;
    }
    // F = 2·0.1 = 0.2; the integral winds up only to 0.5 − 0.2.
    expect(state.integral).toBeCloseTo(0.3, 12);
    expect(command).toBeCloseTo(0.5, 12);
  });

  it('conditional integration stops integrating while the command is at its limit and the error pushes further (Åström & Hägglund 2006, §3.5)', () => {
    const settings: FirmwareSettings = { ...linear('backward-euler'), commandLimit_rad: 0.3 };
    const gains = oneDof(1, 2, 0);
    let state = initialFirmwareState();
    for (let k = 0; k < 500; k++) state = firmwareStep(gains, settings, state, { reference: 1, measurement: 0, feedForwardInput: 0 }).state;
    // kp·e = 1 alone exceeds the limit: nothing was integrated.
    expect(state.integral).toBe(0);
    // Once the error reverses, integration resumes at once (no wound-up state to unwind).
    const back = firmwareStep(gains, settings, state, { reference: 0, measurement: 0.1, feedForwardInput: 0 });
    expect(back.state.integral).toBeCloseTo(-2 * 0.1 * 0.01, 14);
  });

  it('back-calculation pulls the integral towards the limited command with tracking time √(Ti·Td) (Åström & Hägglund 2006, §3.5)', () => {
    // Source: Åström & Hägglund 2006, Advanced PID Control, §3.5: Tt = √(Ti·Td) rule of thumb (Ti when there is no derivative).
    expect(trackingTime_s({ kp: 2, ki: 1, kd: 0.5 })).toBeCloseTo(Math.sqrt(2 * 0.25), 14);
    expect(trackingTime_s({ kp: 2, ki: 4, kd: 0 })).toBeCloseTo(0.5, 14);
    const settings: FirmwareSettings = { ...linear('backward-euler'), antiWindup: 'back-calculation', commandLimit_rad: 0.3 };
    const gains = oneDof(0.1, 1, 0);
    let state = initialFirmwareState();
    for (let k = 0; k < 20000; k++) state = firmwareStep(gains, settings, state, { reference: 1, measurement: 0, feedForwardInput: 0 }).state;
    // Equilibrium of I' = ki·e + (u − v)/Tt with u = 0.3, v = kp·e + I, e = 1, Tt = Ti = 0.1: I = 0.3 − 0.1 + ki·Tt·e.
    expect(state.integral).toBeCloseTo(0.3 - 0.1 + 1 * 0.1 * 1, 6);
  });

  it('weighs the reference: b·r in the proportional term, c·r in the derivative, the full error in the integral', () => {
    const settings = linear('backward-euler');
    const step = (b: number, c: number) =>
      firmwareStep({ kp: 2, ki: 3, kd: 0.5, setpointWeightProportional: b, setpointWeightDerivative: c, feedForward: 0 }, settings, initialFirmwareState(), {
        reference: 1,
        measurement: 0.25,
        feedForwardInput: 0,
      });
    // First sample: no derivative kick (d[−1] = d[0]); P = kp·(b·r − y); I = ki·Ts·(r − y).
    expect(step(1, 0).command).toBeCloseTo(2 * 0.75 + 3 * 0.01 * 0.75, 14);
    expect(step(0, 0).command).toBeCloseTo(2 * -0.25 + 3 * 0.01 * 0.75, 14);
  });
});
