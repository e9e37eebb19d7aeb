/**
 * The scenario stage with its helper thread gives exactly the scenario check and the speed-change certificate of
 * doing everything on one thread: the runs are independent, so splitting them changes nothing but the time.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildSchedule } from '../../src/pipeline/build-schedule.js';
import { recordedCheckModel } from '../../src/pipeline/recheck-schedule.js';
import { scenarioStage, scheduleSpeedChangeCertificate, startScenarioHelper } from '../../src/pipeline/scenario-stage.js';
import { judgeScheduleScenarios, scenarioParameters, scheduleSpeedChanges, type ScenarioCheckInput } from '../../src/pipeline/simulate-schedule.js';
import { numericAcceptanceLimits } from '../../src/schedule/acceptance-limits.js';
import type { Plan } from '../../src/schedule/plan.js';
import { loadVehicle } from '../../src/vehicle/load.js';

const SPRAYER = join('vehicles', 'vineyard-sprayer');
let input: ScenarioCheckInput;

beforeAll(async () => {
  // The sprayer's path loop: a check with failures and a certificate found by bisection (not at the ends of the search).
  const logPaths = readdirSync(join(SPRAYER, 'logs'))
    .filter((name) => name.endsWith('.csv'))
    .sort()
    .map((name) => join(SPRAYER, 'logs', name));
  const { schedule } = await buildSchedule({ vehicle: SPRAYER, logPaths, plan: { loop: { kind: 'path' }, check: { scenarios: false } } });
  const vehicle = loadVehicle(join(SPRAYER, 'vehicle.json'));
  const { parameters, description } = scenarioParameters(recordedCheckModel(schedule), vehicle);
  // The limits of the default plan with a tighter speed-change error that varies with speed (judged sample by sample,
  // on the helper thread too), so that the range scenarios fail too.
  const { minimum_mps, maximum_mps } = schedule.check.range;
  const limits = {
    ...numericAcceptanceLimits(schedule.provenance.plan as unknown as Plan).scenarios,
    maximumSpeedChangeError: { speeds_mps: [minimum_mps, maximum_mps], values: [0.12, 0.08] },
  };
  // The speed changes at the rates the schedule records (the sprayer's service braking, 1 m/s²): they travel to the helper too.
  const sizes = scheduleSpeedChanges(schedule);
  expect(sizes.deceleration_mps2).toBe(1);
  input = {
    schedule,
    parameters,
    steeringLimits: { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps },
    limits,
    model: description,
    sizes,
  };
}, 300_000);

describe('scenarioStage', () => {
  it('with a helper thread gives the check and the certificate of one thread, to the bit (failures, their order, the certified rates)', async () => {
    const alone = { scenarioCheck: judgeScheduleScenarios(input), speedChange: scheduleSpeedChangeCertificate(input) };
    expect(alone.scenarioCheck.failures.some((failure) => failure.scenario === 'braking-in-curve')).toBe(true);
    expect(alone.speedChange.maximumDeceleration_mps2).not.toBeNull();
    const helper = startScenarioHelper({ fromSources: 'allowed' });
    expect(helper).not.toBeNull();
    try {
      expect(await scenarioStage(input, helper)).toEqual(alone);
    } finally {
      helper?.close();
    }
    expect(await scenarioStage(input, null)).toEqual(alone);
  }, 300_000);

  it('when the helper thread is gone, the main thread does its part, to the same numbers', async () => {
    const helper = startScenarioHelper({ fromSources: 'allowed' });
    expect(helper).not.toBeNull();
    helper?.close();
    const result = await scenarioStage(input, helper);
    expect(result.scenarioCheck).toEqual(judgeScheduleScenarios(input));
    expect(result.speedChange).toEqual(scheduleSpeedChangeCertificate(input));
  }, 300_000);

  it('is not started from the TypeScript sources unless allowed (the thread would compile them first)', () => {
    expect(startScenarioHelper()).toBeNull();
  });
});
