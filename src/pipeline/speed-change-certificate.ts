/**
 * The speed-change certificate: the largest acceleration and deceleration (m/s²) for which a speed change through
 * the schedule's whole range, in the curve of the speed-change scenarios, keeps the scenario limits — found by
 * bisection over the rate on a logarithmic scale between CERTIFICATE_SEARCH.lowest_mps2 and .highest_mps2. Each
 * trial is a full scenario run (scenario-run.ts: the lookup and controller equation as firmware runs them, the
 * model at the speed of the moment). Frozen-speed margins say nothing about it.
 */
import { rampScenario, type ScenarioContext } from '../performance/scenario-catalogue.js';
import { judgedRun, judgeScenarioRun, type ScenarioLimits } from '../performance/scenario-limits.js';
import type { OverSpeed } from '../core/by-speed.js';
import { runScenario } from '../performance/scenario-run.js';
import type { ScenarioController, ScenarioVehicle } from '../performance/scenario-simulation.js';
import { SCENARIO_DEFAULTS, SIMULATION_DEFAULTS } from '../performance/defaults.js';
import type { SpeedChangeCertificate } from '../schedule/schedule-types.js';

/**
 * Rates searched, m/s²: from 0.2 (a gentle change, ≈ 0.02 g) to 8 (≈ 0.8 g, about what tyres on dry asphalt give;
 * common practice), bisected `steps` times on a logarithmic scale (5 steps: within a factor 40^(1/32) ≈ 1.12).
 */
export const CERTIFICATE_SEARCH = { lowest_mps2: 0.2, highest_mps2: 8, steps: 5 } as const;

export interface CertificateInput {
  readonly vehicle: ScenarioVehicle;
  readonly controller: ScenarioController;
  readonly context: ScenarioContext;
  readonly limits: OverSpeed<ScenarioLimits>;
}

function largestPassingRate(input: CertificateInput, accelerating: boolean): number | null {
  const { minimum_mps, maximum_mps } = input.context.range;
  const passes = (rate: number): boolean => {
    const name = accelerating ? 'speed-ramp-in-curve' : 'braking-in-curve';
    const scenario = rampScenario(name, input.context, {
      initial_mps: accelerating ? minimum_mps : maximum_mps,
      final_mps: accelerating ? maximum_mps : minimum_mps,
      changeStart_s: SCENARIO_DEFAULTS.leadIn_s + SIMULATION_DEFAULTS.rampHold_s,
      acceleration_mps2: rate,
    });
    const run = runScenario({ vehicle: input.vehicle, controller: input.controller, scenario, stopAtRest: true });
    return judgeScenarioRun(judgedRun(run, minimum_mps), input.limits, input.context.loop).length === 0;
  };
  const { lowest_mps2, highest_mps2, steps } = CERTIFICATE_SEARCH;
  if (passes(highest_mps2)) return highest_mps2;
  if (!passes(lowest_mps2)) return null;
  let low = Math.log(lowest_mps2);
  let high = Math.log(highest_mps2);
  for (let i = 0; i < steps; i++) {
    const middle = (low + high) / 2;
    if (passes(Math.exp(middle))) low = middle;
    else high = middle;
  }
  return Math.exp(low);
}

const shown = (value: number | null): string => (value === null ? 'none' : `${Number(value.toPrecision(3))} m/s²`);

/** The largest acceleration and deceleration (m/s², by bisection over the rate) at which ramps through the whole speed range keep the scenario limits. */
export function speedChangeCertificate(input: CertificateInput): SpeedChangeCertificate {
  const acceleration = largestPassingRate(input, true);
  const deceleration = largestPassingRate(input, false);
  const { lowest_mps2, highest_mps2 } = CERTIFICATE_SEARCH;
  const { minimum_mps, maximum_mps } = input.context.range;
  return {
    maximumAcceleration_mps2: acceleration,
    maximumDeceleration_mps2: deceleration,
    searched_mps2: { lowest: lowest_mps2, highest: highest_mps2 },
    statement:
      `Speed changes through ${Number(minimum_mps.toPrecision(3))}–${Number(maximum_mps.toPrecision(3))} m/s in a curve keep the scenario limits up to ` +
      `${shown(acceleration)} of acceleration and ${shown(deceleration)} of deceleration (searched ${lowest_mps2}–${highest_mps2} m/s²; ` +
      `a value at the top of that range may hold beyond it; 'none': even ${lowest_mps2} m/s² breaks a limit).`,
  };
}
