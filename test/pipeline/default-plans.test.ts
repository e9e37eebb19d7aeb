/**
 * The loops the trade steers by, out of the box: the default plan of every loop kind, and the README's path
 * example, build PASSED schedules on every demo vehicle (identified from its bundled logs), within the
 * time-domain limits; the figures the issue names are checked where it names them (low, mid and top speed).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isDeepStrictEqual } from 'node:util';
import { type ScenarioRunAt, scheduleSpeedChanges } from '../../src/pipeline/simulate-schedule.js';
import { resolvePlan, type PartialPlan, type Plan, type ResolveContext } from '../../src/schedule/plan.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import type { ScheduleBreakpoint, ScheduleFile } from '../../src/schedule/schedule-types.js';
import { demoModels, demoSchedule } from '../helpers/demo-builds.js';
import { runPython } from '../helpers/python.js';

const VEHICLES = ['parcel-van', 'parcel-van-loaded', 'vineyard-sprayer', 'sidewalk-robot'];
/** The README's first JSON plan block (the path loop). */
const readmePathPlan = (): PartialPlan => {
  const readme = readFileSync('README.md', 'utf8');
  const block = [...readme.matchAll(/```json\n([\s\S]*?)```/g)].map((match) => JSON.parse(match[1]) as PartialPlan).find((plan) => plan.loop?.kind === 'path');
  if (block === undefined) throw new Error('the README has no path plan');
  return block;
};

const PLANS: Record<string, () => PartialPlan> = {
  'yaw-rate (default)': () => ({}),
  'heading (default)': () => ({ loop: { kind: 'heading' } }),
  'path (default)': () => ({ loop: { kind: 'path' } }),
  'path (README example)': readmePathPlan,
};

const schedules = new Map<string, ScheduleFile>();
/** Each plan as the build resolves it (the vehicle's test speeds and sample time), by `${vehicle} ${plan name}`. */
const resolved = new Map<string, Plan>();

/** What a build reads of a plan: the plan resolved with the build's context, and the rule parameters as written (expressions are compiled from them). */
const buildInputsOf = (plan: PartialPlan, context: ResolveContext) => ({ plan: resolvePlan(plan, context), ruleParameters: plan.rule?.parameters ?? {} });

beforeAll(async () => {
  // Built from the vehicles' bundled logs as `build` builds (shared with the other test files that read these
  // schedules: test/helpers/demo-builds.ts); the van last, as the report's tests ask for it first.
  for (const vehicle of [...VEHICLES].reverse()) {
    const { models: identified } = await demoModels(vehicle);
    const sampleTime_s = loadVehicle(join('vehicles', vehicle, 'vehicle.json')).controllerSampleTime_s;
    const context: ResolveContext = {
      testSpeeds_mps: identified.speeds.map((speed) => speed.speed_mps),
      ...(sampleTime_s === undefined ? {} : { vehicleSampleTime_s: sampleTime_s }),
    };
    const built: { inputs: ReturnType<typeof buildInputsOf>; schedule: ScheduleFile }[] = [];
    for (const [name, plan] of Object.entries(PLANS)) {
      const inputs = buildInputsOf(plan(), context);
      resolved.set(`${vehicle} ${name}`, inputs.plan);
      // A plan that resolves to one already built (the README's path example is the path default written out) is the
      // same build: the build is deterministic and reads the plan only as resolved, so its schedule is taken again.
      const same = built.find((earlier) => isDeepStrictEqual(earlier.inputs, inputs));
      const schedule = same?.schedule ?? (await demoSchedule(vehicle, plan())).schedule;
      if (same === undefined) built.push({ inputs, schedule });
      schedules.set(`${vehicle} ${name}`, schedule);
    }
  }
}, 600_000);

/** The schedules whose every scenario run is replayed through the compiled integer step (the last describe below). */
const REPLAYED = ['parcel-van', 'vineyard-sprayer', 'sidewalk-robot'].flatMap((vehicle) =>
  ['yaw-rate (default)', 'path (default)'].map((name) => `${vehicle} ${name}`),
);

/**
 * Every scenario of a schedule at low, mid and top speed and at its breakpoints (the scenario check's speeds), simulated
 * once and read by the tests that simulate and that replay it; the replay lets go of them (tens of MB of traces each,
 * which a test process that goes on to other files would otherwise keep).
 */
const runsAtEveryCheckSpeed = new Map<string, Promise<ScenarioRunAt[]>>();
function everyScenarioAtEveryCheckSpeed(key: string): Promise<ScenarioRunAt[]> {
  const found =
    runsAtEveryCheckSpeed.get(key) ??
    (async () => {
      const { simulateSchedule, scenarioSpeeds, scenarioParameters } = await import('../../src/pipeline/simulate-schedule.js');
      const { recordedCheckModel } = await import('../../src/pipeline/recheck-schedule.js');
      const { SCENARIO_NAMES } = await import('../../src/performance/scenario-catalogue.js');
      const schedule = schedules.get(key) as ScheduleFile;
      const file = loadVehicle(join('vehicles', key.split(' ')[0], 'vehicle.json'));
      const { parameters } = scenarioParameters(recordedCheckModel(schedule), file);
      return simulateSchedule({
        schedule,
        parameters,
        steeringLimits: file,
        scenarios: SCENARIO_NAMES,
        speeds: scenarioSpeeds(schedule, { withBreakpoints: true }),
      });
    })();
  runsAtEveryCheckSpeed.set(key, found);
  return found;
}

afterAll(() => runsAtEveryCheckSpeed.clear());

/** The lowest, a middle and the top breakpoint. */
const lowMidTop = (schedule: ScheduleFile): ScheduleBreakpoint[] => {
  const rows = schedule.breakpoints;
  return [rows[0], rows[Math.floor(rows.length / 2)], rows[rows.length - 1]];
};

describe('default plans on every demo vehicle', () => {
  it("the README's path example is the path default written out, as the README says: on every demo vehicle it resolves to the plan {loop: {kind: 'path'}} resolves to", () => {
    for (const vehicle of VEHICLES) expect(resolved.get(`${vehicle} path (README example)`), vehicle).toEqual(resolved.get(`${vehicle} path (default)`));
  });

  for (const vehicle of VEHICLES) {
    for (const name of Object.keys(PLANS)) {
      it(`${vehicle}, ${name}: dense check, every time-domain limit and every scenario pass (speed changes at the vehicle's service rates): status passed`, () => {
        const schedule = schedules.get(`${vehicle} ${name}`) as ScheduleFile;
        expect(schedule.check.failures, JSON.stringify(schedule.check.failures.slice(0, 3))).toEqual([]);
        expect(schedule.check.timeDomain.failures, JSON.stringify(schedule.check.timeDomain.failures)).toEqual([]);
        for (const row of schedule.breakpoints) expect(row.timeDomain).not.toBeNull();
        // Every scenario at every breakpoint, at low, mid and top speed and through the range — the speed changes at
        // the rates the plan records (the vehicle file's service rates where it states them: the sprayer brakes at 1 m/s²).
        const scenarios = schedule.check.scenarios!;
        // Source: the vehicle files — the sprayer states 1 m/s² of service braking; the others state none (our 2 m/s²).
        expect(scheduleSpeedChanges(schedule).deceleration_mps2).toBe(vehicle === 'vineyard-sprayer' ? 1 : 2);
        expect(scenarios.failures.map((failure) => failure.message)).toEqual([]);
        expect(scenarios.passed).toBe(true);
        expect(schedule.status).toBe('passed');
      });

      it(`${vehicle}, ${name}: the speed-change certificate agrees with the speed-change scenarios (pass at the plan's rates ⇔ certified rate above them, within one bisection step)`, () => {
        const schedule = schedules.get(`${vehicle} ${name}`) as ScheduleFile;
        const certificate = schedule.check.speedChange!;
        const step = (certificate.searched_mps2.highest / certificate.searched_mps2.lowest) ** (1 / 32);
        const failed = new Set(schedule.check.scenarios!.failures.map((failure) => failure.scenario));
        const { acceleration_mps2, deceleration_mps2 } = scheduleSpeedChanges(schedule);
        for (const [scenario, rate, certified] of [
          ['speed-ramp-in-curve', acceleration_mps2, certificate.maximumAcceleration_mps2],
          ['braking-in-curve', deceleration_mps2, certificate.maximumDeceleration_mps2],
        ] as const) {
          if (failed.has(scenario)) expect(certified ?? 0, scenario).toBeLessThan(rate * step);
          else expect(certified ?? 0, scenario).toBeGreaterThan(rate / step);
        }
      });
    }

    it(`${vehicle}, default path plan at low, mid and top speed: 3.5 m lane change within 0.5 m, 0.01 rad misalignment removed to 5 % within 15 s, curve-entry error below 0.3 m after 3 s`, () => {
      // The figures (our targets for lateral control; the plan's default acceptance limits).
      const schedule = schedules.get(`${vehicle} path (default)`) as ScheduleFile;
      for (const row of lowMidTop(schedule)) {
        const t = row.timeDomain!;
        expect(t.laneChange!.size_m).toBe(3.5);
        expect(t.laneChange!.length_m).toBeCloseTo(Math.max(4 * row.speed_mps, 20), 12);
        expect(t.laneChange!.peakError_m).toBeLessThanOrEqual(0.5);
        expect(t.steeringMisalignment.size).toBe(0.01);
        expect(t.steeringMisalignment.recoveryTime_s as number).toBeLessThanOrEqual(15);
        expect(t.curveEntry!.errorAfterSettle_m).toBeLessThan(0.3);
      }
    });

    it(`${vehicle}, default heading plan: overshoot ≤ 25 % and a 0.2 rad step through the steering limits settles (no limit cycle)`, () => {
      const schedule = schedules.get(`${vehicle} heading (default)`) as ScheduleFile;
      for (const row of schedule.breakpoints) {
        const t = row.timeDomain!;
        expect(t.referenceStep.overshoot_pct).toBeLessThanOrEqual(25 + 1e-9);
        expect(t.limitedStep!.size).toBe(0.2);
        expect(t.limitedStep!.overshoot_pct).toBeLessThanOrEqual(25 + 1e-9);
        expect(t.limitedStep!.settlingTime_s).not.toBeNull();
      }
    });
  }
});

/**
 * The heading loop with the actuator's rate and angle limits simulated independently in python: the single-track
 * equations written out (Rajamani 2012, §2.3) with the heading as a state, the actuator δ̇ = clamp((c − δ)/τa, ±R),
 * c the command delayed by the actuator delay and the latency and clamped to ±δmax, classical RK4 at a fiftieth of
 * the sample time, and the controller equation of the schedule (its `update` lines: backward Euler, set-point weights,
 * filtered derivative, conditional integration, clamps) coded from its text.
 */
const NONLINEAR_HEADING = `
import json, sys, math
d = json.load(sys.stdin)
m, Iz, a, b, Cf, Cr = d['m'], d['Iz'], d['a'], d['b'], d['Cf'], d['Cr']
v, lag, delay, Ts = d['v'], d['lag'], d['delay'], d['Ts']
dmax, rmax, kp, ki, kd, bw, cw, N = d['dmax'], d['rmax'], d['kp'], d['ki'], d['kd'], d['b_w'], d['c_w'], d['N']
step, T = d['step'], d['T']
sub = 50; h = Ts / sub
def f(vy, r, delta, c):
    Fyf = Cf * (delta - (vy + a * r) / v); Fyr = -Cr * (vy - b * r) / v
    ddelta = max(-rmax, min(rmax, (c - delta) / lag))
    return (Fyf + Fyr) / m - v * r, (a * Fyf - b * Fyr) / Iz, ddelta, r
vy = r = delta = psi = 0.0
Tf = (kd / kp) / N
I = 0.0; D = 0.0; dprev = None; commands = []; out = []
steps = int(round(T / Ts))
for k in range(steps):
    y = psi; out.append(y)
    r_ = step; e = r_ - y; dd = cw * r_ - y
    diff = 0.0 if dprev is None else dd - dprev; dprev = dd
    D = (Tf * D + kd * diff) / (Tf + Ts)
    dI = ki * Ts * e
    Inew = max(-dmax, min(dmax, I + dI))
    vcmd = kp * (bw * r_ - y) + Inew + D
    if abs(vcmd) > dmax and dI * vcmd > 0:
        Inew = max(-dmax, min(dmax, I)); vcmd = kp * (bw * r_ - y) + Inew + D
    I = Inew
    commands.append(max(-dmax, min(dmax, vcmd)))
    for j in range(sub):
        t = k * Ts + j * h
        # the command in force at time t + h/2 (delayed), held between samples
        idx = int(math.floor((t + h / 2 - delay) / Ts + 1e-9))
        c = commands[idx] if 0 <= idx < len(commands) else 0.0
        c = max(-dmax, min(dmax, c))
        a1, b1, c1, d1 = f(vy, r, delta, c)
        a2, b2, c2, d2 = f(vy + h / 2 * a1, r + h / 2 * b1, delta + h / 2 * c1, c)
        a3, b3, c3, d3 = f(vy + h / 2 * a2, r + h / 2 * b2, delta + h / 2 * c2, c)
        a4, b4, c4, d4 = f(vy + h * a3, r + h * b3, delta + h * c3, c)
        vy += h / 6 * (a1 + 2 * a2 + 2 * a3 + a4); r += h / 6 * (b1 + 2 * b2 + 2 * b3 + b4)
        delta += h / 6 * (c1 + 2 * c2 + 2 * c3 + c4); psi += h / 6 * (d1 + 2 * d2 + 2 * d3 + d4)
tail = out[-int(10 / Ts):]
print(json.dumps({'overshoot': 100 * (max(out) / step - 1), 'tailSpread': max(tail) - min(tail), 'final': out[-1]}))
`;

describe('the default heading plan on a 0.2 rad step through the steering limits (independent nonlinear simulation)', () => {
  it('parcel van at its breakpoint nearest 3 m/s: overshoot within 1 % of ours and ≤ 25 %, no limit cycle (the last 10 s within 1 mrad)', async () => {
    const schedule = schedules.get('parcel-van heading (default)') as ScheduleFile;
    const row = schedule.breakpoints.reduce((best, candidate) => (Math.abs(candidate.speed_mps - 3) < Math.abs(best.speed_mps - 3) ? candidate : best));
    const model = schedule.provenance.model as Record<string, number>;
    const result = runPython<{ overshoot: number; tailSpread: number; final: number }>(NONLINEAR_HEADING, {
      m: model.mass_kg,
      Iz: model.yawInertia_kgm2,
      a: model.cgToFrontAxle_m,
      b: model.cgToRearAxle_m,
      Cf: model.frontCorneringStiffness_NPerRad,
      Cr: model.rearCorneringStiffness_NPerRad,
      v: row.speed_mps,
      lag: model.actuatorLag_s,
      delay: model.actuatorDelay_s + schedule.controller.computationLatency_s,
      Ts: schedule.controller.sampleTime_s,
      dmax: schedule.check.timeDomain.steeringLimits.maxSteerAngle_rad,
      rmax: schedule.check.timeDomain.steeringLimits.maxSteerRate_radps,
      kp: row.kp,
      ki: row.ki,
      kd: row.kd,
      b_w: row.setpointWeightProportional,
      c_w: row.setpointWeightDerivative,
      N: schedule.controller.derivativeFilter,
      step: 0.2,
      T: 40,
    });
    expect(result.tailSpread).toBeLessThan(1e-3);
    expect(Math.abs(result.final - 0.2)).toBeLessThan(1e-3);
    expect(result.overshoot).toBeLessThanOrEqual(25);
    expect(Math.abs(result.overshoot - row.timeDomain!.limitedStep!.overshoot_pct)).toBeLessThan(1);
    // The scenario simulator's large step (0.2 rad, path-relative states, the schedule's lookup at the breakpoint) too.
    const { simulateSchedule, scenarioParameters } = await import('../../src/pipeline/simulate-schedule.js');
    const { recordedCheckModel } = await import('../../src/pipeline/recheck-schedule.js');
    const steeringLimits = schedule.check.timeDomain.steeringLimits;
    const { parameters } = scenarioParameters(recordedCheckModel(schedule), {
      name: 'unused',
      mass_kg: 1,
      yawInertia_kgm2: 1,
      cgToFrontAxle_m: 1,
      cgToRearAxle_m: 1,
      steeringRatio: 1,
      ...steeringLimits,
    });
    const [run] = simulateSchedule({ schedule, parameters, steeringLimits, scenarios: ['large-step'], speeds: [row.speed_mps] });
    expect(run.scenario.size).toBe(0.2);
    expect(run.metrics.limitCycle).toBeNull();
    expect(Math.abs(run.metrics.overshoot_pct! - result.overshoot)).toBeLessThan(0.5);
  });
});

describe('simulate on every demo vehicle and default plan', () => {
  it('runs every scenario at low, mid and top speed and through the range: finite figures, the step halving converged', async () => {
    const { simulateSchedule, scenarioSpeeds, scenarioParameters } = await import('../../src/pipeline/simulate-schedule.js');
    const { recordedCheckModel } = await import('../../src/pipeline/recheck-schedule.js');
    const { loadVehicle } = await import('../../src/vehicle/load.js');
    const { SCENARIO_NAMES } = await import('../../src/performance/scenario-catalogue.js');
    for (const vehicle of VEHICLES) {
      const file = loadVehicle(join('vehicles', vehicle, 'vehicle.json'));
      const simulated = new Set<ScheduleFile>();
      for (const name of Object.keys(PLANS)) {
        const schedule = schedules.get(`${vehicle} ${name}`) as ScheduleFile;
        // A plan that resolved to one already built has the same schedule (see beforeAll): simulated once.
        if (simulated.has(schedule)) continue;
        simulated.add(schedule);
        const { parameters } = scenarioParameters(recordedCheckModel(schedule), file);
        // A replayed schedule's runs at every check speed (low, mid and top among them), simulated once for both tests.
        const runs = REPLAYED.includes(`${vehicle} ${name}`)
          ? await everyScenarioAtEveryCheckSpeed(`${vehicle} ${name}`)
          : simulateSchedule({
              schedule,
              parameters,
              steeringLimits: file,
              scenarios: SCENARIO_NAMES,
              speeds: scenarioSpeeds(schedule, { withBreakpoints: false }),
            });
        const names = new Set(runs.map((run) => run.scenario.name));
        expect(names.size, `${vehicle} ${name}`).toBe(schedule.loop.kind === 'yaw-rate' ? SCENARIO_NAMES.length - 1 : SCENARIO_NAMES.length);
        for (const run of runs) {
          const label = `${vehicle} ${name} ${run.scenario.name} ${run.speed_mps}`;
          expect(run.converged, label).toBe(true);
          for (const value of [
            run.metrics.peakError,
            run.metrics.finalError,
            run.metrics.peakSteerAngle_rad,
            run.metrics.peakSteerRate_radps,
            run.metrics.peakLateralAcceleration_mps2,
          ]) {
            expect(Number.isFinite(value), label).toBe(true);
          }
        }
      }
    }
  }, 120_000);

  it("gives the build's misalignment and lateral-force figures at the breakpoints (two independent simulations: state space relative to the path vs transfer functions by superposition)", async () => {
    const { simulateSchedule, scenarioParameters } = await import('../../src/pipeline/simulate-schedule.js');
    const { recordedCheckModel } = await import('../../src/pipeline/recheck-schedule.js');
    const { loadVehicle } = await import('../../src/vehicle/load.js');
    for (const vehicle of VEHICLES) {
      const file = loadVehicle(join('vehicles', vehicle, 'vehicle.json'));
      for (const name of ['heading (default)', 'path (default)']) {
        const schedule = schedules.get(`${vehicle} ${name}`) as ScheduleFile;
        const { parameters } = scenarioParameters(recordedCheckModel(schedule), file);
        const rows = lowMidTop(schedule);
        const speeds = rows.map((row) => row.speed_mps);
        const scenarios = ['misalignment', 'side-force'] as const;
        // A replayed schedule's runs are simulated already (at every breakpoint): these two scenarios at these speeds.
        const runs = REPLAYED.includes(`${vehicle} ${name}`)
          ? (await everyScenarioAtEveryCheckSpeed(`${vehicle} ${name}`)).filter(
              (run) => (scenarios as readonly string[]).includes(run.scenario.name) && speeds.includes(run.speed_mps),
            )
          : simulateSchedule({ schedule, parameters, steeringLimits: file, scenarios, speeds });
        expect(runs.length, `${vehicle} ${name}`).toBe(6);
        for (const run of runs) {
          const row = rows.find((r) => r.speed_mps === run.speed_mps)!;
          const figure = run.scenario.name === 'misalignment' ? row.timeDomain!.steeringMisalignment : row.timeDomain!.lateralForce!;
          const label = `${vehicle} ${name} ${run.scenario.name} ${run.speed_mps}`;
          expect(run.scenario.size, label).toBeCloseTo(figure.size, 9);
          expect(Math.abs(run.metrics.peakError - figure.peakError), label).toBeLessThan(1e-6 * figure.peakError);
          if (figure.recoveryTime_s !== null && figure.recoveryTime_s < 25) {
            expect(Math.abs(run.metrics.settlingTime_s! - figure.recoveryTime_s), label).toBeLessThanOrEqual(schedule.controller.sampleTime_s + 1e-9);
          }
        }
      }
    }
  }, 120_000);
});

describe("the fixed-point header's controller step on the demo vehicles' default schedules", () => {
  for (const key of REPLAYED) {
    it(`${key.replace(' ', ', ')}: every scenario replayed through the compiled integer step stays within its quantisation error bound, a useful bound`, async () => {
      const { replaysOf } = await import('../export/controller-replay.js');
      const { compareIntegerStep } = await import('../export/integer-step-replay.js');
      const schedule = schedules.get(key) as ScheduleFile;
      const runs = replaysOf(await everyScenarioAtEveryCheckSpeed(key));
      runsAtEveryCheckSpeed.delete(key);
      const { worstDifference, peakCommand } = compareIntegerStep(schedule, 'Q16.16', runs);
      expect(worstDifference).toBeGreaterThan(0);
      expect(peakCommand).toBeGreaterThan(0.1);
    });
  }
});
