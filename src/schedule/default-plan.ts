/**
 * The default plan written out in full (`speedband plan --default [--loop KIND]`): a plan file that, given
 * to `build --plan`, builds exactly what no plan builds. The fields whose default depends on the data
 * (the speed range from the test speeds, the sample time from the vehicle file, the latency of one
 * sample) are left out and named in its description; docs/plan.md lists every field.
 */
import { VERSION } from '../version.js';
import type { LoopKind, PartialPlan } from './plan.js';
import { PLAN_DEFAULTS } from './plan.js';

/** The default plan for a loop kind, as a plan file (JSON-able, every constant default written). */
export function defaultPlanFile(kind: LoopKind = PLAN_DEFAULTS.loop.kind): PartialPlan {
  const { controller, breakpoints } = PLAN_DEFAULTS;
  const pathNote =
    kind === 'path'
      ? ' On a path loop SIMC at τc = θ leaves little phase margin (about 22° with N = 10): damping-target with a settlingDistance_m is the usual start.'
      : '';
  return {
    description:
      `The default plan of speedband ${VERSION} for a ${kind} loop. Left out because the data decide them: speeds (minimum_mps and maximum_mps the lowest and highest test speed, ` +
      `lowSpeedFloor_mps the lowest), controller.sampleTime_s (the vehicle file's controllerSampleTime_s, else ${controller.sampleTime_s} s) and ` +
      `controller.computationLatency_s (one sample). Every field, its unit, default and source: docs/plan.md.${pathNote}`,
    loop: { ...PLAN_DEFAULTS.loop, kind },
    rule: { name: PLAN_DEFAULTS.rule.name, parameters: {} },
    speeds: {},
    breakpoints: breakpoints.mode === 'automatic' ? { count: breakpoints.count, spacing: breakpoints.spacing } : { speeds_mps: breakpoints.speeds_mps },
    interpolation: PLAN_DEFAULTS.interpolation,
    controller: { form: controller.form, derivativeFilter: controller.derivativeFilter, discretisation: controller.discretisation },
    acceptance: { ...PLAN_DEFAULTS.acceptance },
    check: { ...PLAN_DEFAULTS.check },
  };
}
