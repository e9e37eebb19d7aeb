/**
 * The default plan written out in full (`speedband plan --default [--loop KIND]`): a plan file that, given
 * to `build --plan`, builds exactly what no plan builds. The fields whose default depends on the data
 * (the speed range from the test speeds, the sample time and the speed changes the scenarios judge from the
 * vehicle file, the latency of one sample) are left out and named in its description; docs/plan.md lists every field.
 */
import { VERSION } from '../version.js';
import type { LoopKind, PartialPlan } from './plan.js';
import { DEFAULT_PATH_PREVIEW, DEFAULT_RULES, PLAN_DEFAULTS } from './plan.js';

/** The default plan for a loop kind, as a plan file (JSON-able, every constant default written). */
export function defaultPlanFile(kind: LoopKind = PLAN_DEFAULTS.loop.kind): PartialPlan {
  const { controller, breakpoints } = PLAN_DEFAULTS;
  const rule = DEFAULT_RULES[kind];
  const pathNote =
    kind === 'path'
      ? ' On a path loop MIGO (the largest integral gain with Ms and Mt within a bound, on the full loop) with the bound searched is the default: SIMC at τc = θ leaves the path loop unstable.'
      : '';
  return {
    description:
      `The default plan of speedband ${VERSION} for a ${kind} loop. Left out because the data decide them: speeds (minimum_mps and maximum_mps the lowest and highest test speed, ` +
      `lowSpeedFloor_mps the lowest), controller.sampleTime_s (the vehicle file's controllerSampleTime_s, else ${controller.sampleTime_s} s), ` +
      `controller.computationLatency_s (one sample) and check.rampAcceleration_mps2 and check.brakingDeceleration_mps2 (the vehicle file's serviceAcceleration_mps2 and ` +
      `serviceDeceleration_mps2, else ${PLAN_DEFAULTS.check.rampAcceleration_mps2} and ${PLAN_DEFAULTS.check.brakingDeceleration_mps2} m/s²)${rule.tuneFor === 'fastest-passing' ? ', and rule.searchOn (the worst case when a variations section is added under robust acceptance, else the nominal model)' : ''}. ` +
      `Every field, its unit, default and source: docs/plan.md.${pathNote}`,
    loop: { ...PLAN_DEFAULTS.loop, ...(kind === 'path' ? DEFAULT_PATH_PREVIEW : {}), kind },
    rule: { name: rule.name, tuneFor: rule.tuneFor, parameters: {} },
    speeds: {},
    breakpoints: breakpoints.mode === 'automatic' ? { count: breakpoints.count, spacing: breakpoints.spacing } : { speeds_mps: breakpoints.speeds_mps },
    interpolation: PLAN_DEFAULTS.interpolation,
    controller: {
      form: controller.form,
      derivativeFilter: controller.derivativeFilter,
      discretisation: controller.discretisation,
      antiWindup: controller.antiWindup,
    },
    acceptance: { ...PLAN_DEFAULTS.acceptance },
    check: (({ rampAcceleration_mps2: _ramp, brakingDeceleration_mps2: _braking, ...constant }) => constant)(PLAN_DEFAULTS.check),
  };
}
