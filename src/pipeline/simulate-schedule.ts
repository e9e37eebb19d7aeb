/**
 * Drive a schedule through the scenarios (src/performance/scenario-catalogue.ts) as the firmware runs it
 * (src/schedule/schedule-lookup.ts scheduleFirmware) on the single-track model: the one the schedule was
 * checked on, a fresh identification, or the vehicle file's nominal values.
 */
import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { prepareScenario, RANGE_SCENARIOS, SCENARIO_NAMES, type ScenarioName, type ScenarioSizes } from '../performance/scenario-catalogue.js';
import { runScenario, type ScenarioRun } from '../performance/scenario-run.js';
import { judgedRun, judgeScenarioRun, type JudgedRun, type ScenarioLimits } from '../performance/scenario-limits.js';
import type { OverSpeed } from '../core/by-speed.js';
import type { ScenarioController, ScenarioVehicle } from '../performance/scenario-simulation.js';
import { scheduleFirmware } from '../schedule/schedule-lookup.js';
import { planSpeedChanges, type Plan } from '../schedule/plan.js';
import type { ScheduleFile, ScheduleScenarioCheck } from '../schedule/schedule-types.js';
import { singleTrackParametersFromVehicle } from '../vehicle/single-track.js';
import type { SingleTrackParameters, Vehicle } from '../vehicle/types.js';
import type { CheckModel } from './check-model.js';
import { scheduleLoopAndController } from './recheck-schedule.js';

/** One scenario run of a schedule at one starting speed: the scenario, its traces and figures. */
export interface ScenarioRunAt extends ScenarioRun {
  /** The speed the run starts at, m/s (a range scenario: the start of its speed change). */
  readonly speed_mps: number;
}

/** Scenarios that stay in the linear range: at a breakpoint they are its exact time-domain figures. */
export const LINEAR_SCENARIOS: readonly ScenarioName[] = ['small-step', 'misalignment', 'side-force'];

/** The speeds the per-speed scenarios run at: low, middle and top of the range, with the breakpoints when asked. */
export function scenarioSpeeds(
  schedule: Pick<ScheduleFile, 'check' | 'breakpoints'>,
  options: {
    /** Add the breakpoints inside the range (the scenario check, judgeScheduleScenarios); false: the three speeds only (the simulate command). */
    readonly withBreakpoints: boolean;
  },
): number[] {
  const { withBreakpoints } = options;
  const { minimum_mps: low, maximum_mps: top } = schedule.check.range;
  const speeds = new Set([low, (low + top) / 2, top]);
  if (withBreakpoints) for (const row of schedule.breakpoints) if (row.speed_mps >= low && row.speed_mps <= top) speeds.add(row.speed_mps);
  return [...speeds].filter((speed) => speed > 0).sort((p, q) => p - q);
}

/** The single-track model to simulate: the check model's when it is one, else the vehicle file's nominal values. */
export function scenarioParameters(model: CheckModel | null, vehicle: Vehicle): { parameters: SingleTrackParameters; description: string } {
  if (model !== null && model.summary.kind === 'single-track') {
    const at = model.modelAt(1);
    if (at.kind === 'single-track') return { parameters: at.parameters, description: model.description };
  }
  return { parameters: singleTrackParametersFromVehicle(vehicle), description: `nominal single-track values of vehicle file ${quoted(vehicle.name)}` };
}

export interface SimulateScheduleInput {
  readonly schedule: ScheduleFile;
  readonly parameters: SingleTrackParameters;
  readonly steeringLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
  readonly scenarios: readonly ScenarioName[];
  /** Speeds of the per-speed scenarios, m/s. */
  readonly speeds: readonly number[];
  /** Sizes replacing the scenario defaults (simulate's options). */
  readonly sizes?: ScenarioSizes;
  /** For judging only: runs hold their values once at rest (src/performance/scenario-simulation.ts REST); traces are then not exact. */
  readonly stopAtRest?: boolean;
}

/** The speed changes through the range a schedule's scenarios are judged at: those of the plan it records (plan.ts planSpeedChanges). */
export function scheduleSpeedChanges(schedule: Pick<ScheduleFile, 'provenance'>): ReturnType<typeof planSpeedChanges> {
  return planSpeedChanges(schedule.provenance.plan as { readonly check?: Partial<Plan['check']> });
}

/** The scenario controller a schedule describes. */
export function scheduleScenarioController(schedule: ScheduleFile): ScenarioController {
  const { loop } = scheduleLoopAndController(schedule);
  return { loop, ...scheduleFirmware(schedule) };
}

/**
 * The actuator room the build recorded at the breakpoints (largest reference within the steering limits), at a speed:
 * a breakpoint's own, between breakpoints the smaller neighbour's, beyond them the end one's.
 */
export function actuatorRoomLookup(schedule: Pick<ScheduleFile, 'breakpoints'>): (speed_mps: number) => number {
  const rows = schedule.breakpoints.filter((row) => row.timeDomain !== null);
  return (speed_mps) => {
    if (rows.length === 0) return Number.POSITIVE_INFINITY;
    const room = (k: number): number => rows[k].timeDomain!.actuator.largestReference;
    let k = 0;
    while (k < rows.length - 1 && rows[k + 1].speed_mps <= speed_mps) k++;
    if (rows[k].speed_mps === speed_mps || k === rows.length - 1 || speed_mps < rows[0].speed_mps) return room(speed_mps < rows[0].speed_mps ? 0 : k);
    return Math.min(room(k), room(k + 1));
  };
}

/** Every applicable scenario at every speed (range scenarios once), in the order given. */
export function simulateSchedule(input: SimulateScheduleInput): ScenarioRunAt[] {
  const { schedule } = input;
  const controller = scheduleScenarioController(schedule);
  const vehicle: ScenarioVehicle = { parameters: input.parameters, ...input.steeringLimits };
  const context = {
    loop: schedule.loop.kind,
    parameters: input.parameters,
    maxSteerAngle_rad: input.steeringLimits.maxSteerAngle_rad,
    range: schedule.check.range,
    linearRoomAt: actuatorRoomLookup(schedule),
    ...(input.sizes === undefined ? {} : { sizes: input.sizes }),
  };
  const runs: ScenarioRunAt[] = [];
  for (const name of input.scenarios) {
    if (!SCENARIO_NAMES.includes(name)) {
      throw new SpeedbandError('simulate.unknownScenario', `scenario ${quoted(name)} is not one speedband knows — give one of ${SCENARIO_NAMES.join(', ')}`);
    }
    const speeds = RANGE_SCENARIOS.includes(name) ? [schedule.check.range.minimum_mps] : input.speeds;
    for (const speed of speeds) {
      const prepared = prepareScenario(name, context, speed);
      if (prepared === null) continue;
      runs.push({
        speed_mps: prepared.setup.speed.initial_mps,
        ...runScenario({ vehicle, controller, scenario: prepared, stopAtRest: input.stopAtRest === true }),
      });
    }
  }
  return runs;
}

export type { JudgedRun };

export type ScenarioCheckInput = Omit<SimulateScheduleInput, 'scenarios' | 'speeds'> & { readonly limits: OverSpeed<ScenarioLimits>; readonly model: string };

/** What the scenario check keeps of a run (scenario-limits.ts judgedRun: a speed change keeps its speed and error traces). */
const judged = (runs: readonly ScenarioRunAt[]): JudgedRun[] => runs.map((run) => judgedRun(run, run.speed_mps));

/**
 * The runs of the scenario check in its order: the per-speed ones through the limits at every speed, then (part
 * 'range') the speed changes through the range, then the linear ones where the breakpoints have no figures.
 * Parts apart so that the range part, the longest runs, can go to another thread (scenario-stage.ts).
 */
export function scenarioCheckRuns(input: ScenarioCheckInput, part: 'per-speed' | 'range'): { readonly before: JudgedRun[]; readonly after: JudgedRun[] } {
  const speeds = scenarioSpeeds(input.schedule, { withBreakpoints: true });
  if (part === 'range') {
    return {
      before: judged(simulateSchedule({ ...input, scenarios: SCENARIO_NAMES.filter((name) => RANGE_SCENARIOS.includes(name)), speeds, stopAtRest: true })),
      after: [],
    };
  }
  // At a breakpoint with time-domain figures the linear scenarios are those figures (the same closed loop, exact:
  // test/pipeline/default-plans.test.ts), judged by the build already; the scenarios through the limits run everywhere.
  const figured = new Set(input.schedule.breakpoints.filter((row) => row.timeDomain !== null).map((row) => row.speed_mps));
  const linear = new Set<ScenarioName>(LINEAR_SCENARIOS);
  const perSpeed = SCENARIO_NAMES.filter((name) => !linear.has(name) && !RANGE_SCENARIOS.includes(name));
  return {
    before: judged(simulateSchedule({ ...input, scenarios: perSpeed, speeds, stopAtRest: true })),
    after: judged(simulateSchedule({ ...input, scenarios: LINEAR_SCENARIOS, speeds: speeds.filter((speed) => !figured.has(speed)), stopAtRest: true })),
  };
}

/** The scenario check from its judged runs (scenarioCheckRuns's order): failures ordered by speed, then scenario. */
export function scenarioCheckOf(input: ScenarioCheckInput, runs: readonly JudgedRun[]): ScheduleScenarioCheck {
  const failures = runs
    .flatMap((run) => judgeScenarioRun(run, input.limits, input.schedule.loop.kind))
    .sort((p, q) => p.speed_mps - q.speed_mps || SCENARIO_NAMES.indexOf(p.scenario) - SCENARIO_NAMES.indexOf(q.scenario));
  return {
    passed: failures.length === 0,
    limits: input.limits,
    model: input.model,
    speeds_mps: scenarioSpeeds(input.schedule, { withBreakpoints: true }),
    scenarios: [...new Set(runs.map((run) => run.scenario))],
    failures,
  };
}

/**
 * The scenario check of a schedule: every scenario at each breakpoint and at low, middle and top speed, the range
 * scenarios once, judged against `limits` (src/performance/scenario-limits.ts); failures ordered by speed.
 */
export function judgeScheduleScenarios(input: ScenarioCheckInput): ScheduleScenarioCheck {
  const perSpeed = scenarioCheckRuns(input, 'per-speed');
  return scenarioCheckOf(input, [...perSpeed.before, ...scenarioCheckRuns(input, 'range').before, ...perSpeed.after]);
}
