import { printFigure, timeMs } from './measure.js';
import { applyRule } from '../src/tuning/registry.js';
import { designModelFromSingleTrack } from '../src/tuning/design-model.js';
import { tuneOperatingPoint } from '../src/tuning/operating-point.js';
import type { ControllerSettings } from '../src/controller/types.js';
import type { SingleTrackParameters } from '../src/vehicle/types.js';

// Tuning figures: rule formulas alone, the design model from the single-track model, and a whole
// operating point (loop plant + design model + rule + full-loop analysis), as the schedule builder calls it.
const controller: ControllerSettings = { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler', computationLatency_s: 0.005 };
// Invented demo van (synthetic numbers).
const van: SingleTrackParameters = {
  mass_kg: 3400,
  yawInertia_kgm2: 11000,
  cgToFrontAxle_m: 1.75,
  cgToRearAxle_m: 1.85,
  frontCorneringStiffness_NPerRad: 120000,
  rearCorneringStiffness_NPerRad: 180000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.05,
};
const speeds = Array.from({ length: 200 }, (_, i) => 2 + (23 * i) / 199);

const ruleCount = 100_000;
const rules = ['ziegler-nichols-ultimate', 'imc-pid', 'simc'] as const;
for (let i = 0; i < 1000; i++) applyRule('simc', { integrators: 0, gain: 2, lags_s: [0.2], deadTime_s: 0.1 }, {}, { speed_mps: 5 });
const rulesMs = await timeMs(() => {
  for (let i = 0; i < ruleCount; i++) applyRule(rules[i % 3], { integrators: 0, gain: 2 + (i % 7), lags_s: [0.2], deadTime_s: 0.1 }, {}, { speed_mps: 5 });
});
printFigure('rule formulas (ZN ultimate, IMC-PID, SIMC), per second', (ruleCount / rulesMs) * 1000, 'rules/s');

const designMs = await timeMs(() => {
  for (const speed of speeds) designModelFromSingleTrack({ kind: 'path', parameters: van, speed_mps: speed, controllerDelay_s: 0.01 });
});
printFigure('design model from the single-track model (two-point FOPDT)', designMs / speeds.length, 'ms/speed');

const lumpedMs = await timeMs(() => {
  for (const speed of speeds) {
    tuneOperatingPoint({
      loop: { kind: 'yaw-rate' },
      speed_mps: speed,
      model: { kind: 'lumped', yawRate: { kind: 'fopdt', gain: 0.3 * speed, timeConstant_s: 0.15, deadTime_s: 0.08 } },
      rule: 'simc',
      ruleParameters: {},
      controller,
    });
  }
});
printFigure('tuneOperatingPoint, lumped FOPDT, yaw-rate SIMC', lumpedMs / speeds.length, 'ms/point');

const singleTrackMs = await timeMs(() => {
  for (const speed of speeds) {
    tuneOperatingPoint({
      loop: { kind: 'path', preview_m: 2 },
      speed_mps: speed,
      model: { kind: 'single-track', parameters: van },
      rule: 'damping-target',
      ruleParameters: {},
      controller,
    });
  }
});
printFigure('tuneOperatingPoint, single-track, path damping-target', singleTrackMs / speeds.length, 'ms/point');
