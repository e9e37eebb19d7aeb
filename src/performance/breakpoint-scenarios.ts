/**
 * The per-speed scenarios at one breakpoint, judged against the scenario limits: at a breakpoint the schedule's
 * lookup returns that breakpoint's numbers exactly, so the firmware there is the controller with those numbers
 * held — which is what a fastest-passing search can judge a candidate by before any schedule exists.
 */
import type { FirmwareGains, FirmwareSettings } from '../controller/firmware-step.js';
import type { LoopSpecification } from '../loops/types.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { prepareScenario, RANGE_SCENARIOS, SCENARIO_NAMES, type ScenarioName } from './scenario-catalogue.js';
import { judgedRun, judgeScenarioRun, type ScenarioFailure, type ScenarioLimits } from './scenario-limits.js';
import { runScenario } from './scenario-run.js';

/** The scenarios run at each breakpoint (and at low, middle and top speed): every per-speed one. */
export const PER_SPEED_SCENARIOS: readonly ScenarioName[] = SCENARIO_NAMES.filter((name) => !RANGE_SCENARIOS.includes(name));

/**
 * The scenarios a fastest-passing search judges each candidate by: those through the steering limits, where a limit
 * cycle shows (the linear ones repeat the exact time-domain figures the search already judges).
 */
export const SEARCH_SCENARIOS: readonly ScenarioName[] = ['large-step', 'initial-offset'];

export interface BreakpointScenariosInput {
  readonly parameters: SingleTrackParameters;
  readonly vehicleLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
  readonly loop: LoopSpecification;
  /** The firmware's settings (command limit and integrator clamp: the steering-angle limit). */
  readonly settings: FirmwareSettings;
  readonly gains: FirmwareGains;
  readonly feedForwardLeadTime_s: number;
  readonly speed_mps: number;
  readonly range: { readonly minimum_mps: number; readonly maximum_mps: number };
  readonly limits: ScenarioLimits;
  /** Which scenarios (default: every per-speed one). */
  readonly scenarios?: readonly ScenarioName[];
}

export function breakpointScenarioFailures(input: BreakpointScenariosInput): ScenarioFailure[] {
  const controller = { loop: input.loop, settings: input.settings, at: () => ({ gains: input.gains, feedForwardLeadTime_s: input.feedForwardLeadTime_s }) };
  const vehicle = { parameters: input.parameters, ...input.vehicleLimits };
  const context = { loop: input.loop.kind, parameters: input.parameters, maxSteerAngle_rad: input.vehicleLimits.maxSteerAngle_rad, range: input.range };
  const failures: ScenarioFailure[] = [];
  for (const name of input.scenarios ?? PER_SPEED_SCENARIOS) {
    const prepared = prepareScenario(name, context, input.speed_mps);
    if (prepared === null) continue;
    failures.push(
      ...judgeScenarioRun(
        judgedRun(runScenario({ vehicle, controller, scenario: prepared, stopAtRest: true }), input.speed_mps),
        input.limits,
        input.loop.kind,
      ),
    );
  }
  return failures;
}
