import { SpeedbandError } from '../core/errors.js';
import { analyseLoop } from '../verify/analyse-loop.js';
import { TUNING_DEFAULTS } from './defaults.js';
import { fullLoopResponse, type FullLoop } from './full-loop.js';
import { reduceByHalfRule } from './half-rule.js';
import { maximiseIntegralGain } from './migo-search.js';
import { ruleNotApplicable } from './not-applicable.js';
import { requirePositive } from './parameter-required.js';
import type { ControllerType, DesignModel, RuleContext, RuleParameters, RuleResult, TuningRule } from './types.js';
import type { PidGains } from '../controller/types.js';

const CITATION =
  'Åström, K. J., Panagopoulos, H. & Hägglund, T. (1998). Design of PI controllers based on non-convex optimization. Automatica 34(5), 585–601 — MIGO: maximum integral gain subject to a bound on the sensitivity peaks; here on the sampled loop the firmware runs, with Ms ≤ M and Mt ≤ M';

/** How MIGO's grid design is checked on the exact sampled loop and lowered when over the bound (our choice). */
export const MIGO_EXACT_CHECK_DEFAULTS = {
  /** Largest relative excess of the exact peaks over the target accepted before ki is reduced (the grid is 5.9 % apart). */
  peakTolerance: 0.005,
  /** Phase-margin shortfall accepted before ki is reduced, degrees (the grid interpolates crossovers linearly). */
  phaseTolerance_deg: 0.5,
  /** Steps of ki reduction tried when the exact analysis finds the grid's design over the bound. */
  shrinkSteps: 40,
  /** ki × this at each step. */
  shrinkFactor: 0.97,
} as const;
const { peakTolerance: EXACT_TOLERANCE, phaseTolerance_deg: EXACT_PHASE_TOLERANCE_deg, shrinkSteps: SHRINK_STEPS } = MIGO_EXACT_CHECK_DEFAULTS;

/**
 * MIGO (Åström, Panagopoulos & Hägglund 1998; Åström & Hägglund 2006, Advanced PID Control, §7.4): of all PI
 * or PID settings whose loop keeps both sensitivity peaks within M (Ms ≤ M, Mt ≤ M — the combined robustness
 * bound AMIGO was derived with, Åström & Hägglund 2004), the one with the largest integral gain ki, which
 * for a step load disturbance at the plant input (steering misalignment, crosswind) minimises the integrated
 * error. Solved numerically on the loop as the firmware runs it — the plant's exact pulse frequency response
 * under the discrete PID with its derivative filter (full-loop.ts, migo-search.ts) — then confirmed on the
 * exact analysis (src/verify): ki is lowered until the exact peaks keep the bound. With phaseMarginTarget_deg the
 * phase margin is a further constraint (not part of the published design; the fastest-passing search sets it
 * to the plan's limit, so that the largest M that also keeps the phase margin is found). Any plant class; PI by
 * default for self-regulating plants, PID otherwise (derivative action is needed on a double integrator).
 */
export function migo(model: DesignModel, parameters: RuleParameters, context: RuleContext): RuleResult {
  const loop = context.fullLoop;
  if (loop === undefined) {
    throw ruleNotApplicable(
      'migo',
      model,
      'MIGO optimises on the full loop the firmware runs, which this call does not give (tune through tuneOperatingPoint or a build)',
    );
  }
  const target = requirePositive('migo', 'sensitivityPeakTarget (M)', parameters.sensitivityPeakTarget ?? TUNING_DEFAULTS.sensitivityPeakTarget);
  if (!(target > 1)) {
    throw new SpeedbandError(
      'tuning.invalidParameter',
      `rule migo: sensitivityPeakTarget (M) is ${target}; expected a bound above 1 (1.2–2 is the usual range; Ms = 1 would need L = 0)`,
      {
        details: { rule: 'migo', parameter: 'sensitivityPeakTarget', value: target },
      },
    );
  }
  const controllerType: ControllerType = parameters.controllerType ?? (model.integrators === 0 && model.lags_s.length < 2 ? 'PI' : 'PID');
  if (controllerType === 'P') throw ruleNotApplicable('migo', model, 'MIGO maximises the integral gain: it gives PI and PID settings only');
  const effective = reduceByHalfRule(model, 0).model.deadTime_s;
  const crossover = 1 / (2 * Math.max(effective, loop.controller.sampleTime_s));
  const response = fullLoopResponse(loop, crossover * 1e-3);
  let index = 0;
  while (index < response.frequency_radps.length - 1 && response.frequency_radps[index] < crossover) index++;
  const scale = 1 / Math.hypot(response.plantRe[index], response.plantIm[index]);
  const sign = model.gain < 0 ? -1 : 1;
  const search = maximiseIntegralGain({
    response,
    bounds: {
      sensitivity: target,
      complementary: target,
      ...(parameters.phaseMarginTarget_deg === undefined ? {} : { phaseMargin_deg: parameters.phaseMarginTarget_deg }),
    },
    structure: controllerType,
    proportionalScale: scale,
    derivativeTimeScale_s: 1 / crossover,
    sign,
    ...(context.startGains === undefined ? {} : { start: context.startGains }),
  });
  if (search.gains.ki === 0) {
    throw ruleNotApplicable(
      'migo',
      model,
      `no ${controllerType} setting keeps both sensitivity peaks within M = ${target} on this loop — raise sensitivityPeakTarget${controllerType === 'PI' ? ' or use a PID' : ''}`,
    );
  }
  const confirmed = confirmExactly(search.gains, loop, target, parameters.phaseMarginTarget_deg);
  return {
    rule: 'migo',
    citation: CITATION,
    controllerType,
    gains: confirmed.gains,
    ruleForm: {
      form: 'parallel',
      gain: confirmed.gains.kp,
      integralTime_s: confirmed.gains.kp / confirmed.gains.ki,
      derivativeTime_s: confirmed.gains.kp === 0 ? 0 : confirmed.gains.kd / confirmed.gains.kp,
    },
    designModel: model,
    intermediate: {
      sensitivityPeakTarget: target,
      ...(parameters.phaseMarginTarget_deg === undefined ? {} : { phaseMarginTarget_deg: parameters.phaseMarginTarget_deg }),
      sensitivityPeak: confirmed.sensitivityPeak,
      complementarySensitivityPeak: confirmed.complementarySensitivityPeak,
      gridEvaluations: search.evaluations,
      exactReductions: confirmed.reductions,
    },
    warnings: [],
  };
}

/** Lower ki (× shrinkFactor a step) until the exact sampled analysis finds the loop stable with both peaks within the target. */
function confirmExactly(
  gains: PidGains,
  loop: FullLoop,
  target: number,
  phaseMargin_deg: number | undefined,
): { gains: PidGains; sensitivityPeak: number; complementarySensitivityPeak: number; reductions: number } {
  let current = gains;
  for (let step = 0; step <= SHRINK_STEPS; step++) {
    const margins = analyseLoop({
      plant: loop.plant,
      pid: { kp: current.kp, ki: current.ki, kd: current.kd, derivativeFilter: loop.controller.derivativeFilter, form: 'parallel' },
      sampleTime_s: loop.controller.sampleTime_s,
      discretisation: loop.controller.discretisation,
    });
    const bound = target * (1 + EXACT_TOLERANCE);
    const phaseOk = phaseMargin_deg === undefined || (margins.phaseMargin_deg ?? 180) >= phaseMargin_deg - EXACT_PHASE_TOLERANCE_deg;
    if (margins.stable && margins.sensitivityPeak <= bound && margins.complementarySensitivityPeak <= bound && phaseOk) {
      return { gains: current, sensitivityPeak: margins.sensitivityPeak, complementarySensitivityPeak: margins.complementarySensitivityPeak, reductions: step };
    }
    current = { ...current, ki: current.ki * MIGO_EXACT_CHECK_DEFAULTS.shrinkFactor };
  }
  throw new SpeedbandError(
    'tuning.notConfirmed',
    `rule migo: the exact analysis of the sampled loop does not confirm the optimised design within M = ${target} (kp = ${gains.kp}, ki = ${gains.ki}, kd = ${gains.kd}) — report this loop`,
    {
      details: { ...gains, sensitivityPeakTarget: target },
    },
  );
}

export const MIGO: TuningRule = {
  name: 'migo',
  title: 'MIGO (M-constrained integral gain optimisation, on the full loop)',
  citation: CITATION,
  plantClasses: ['self-regulating', 'second-order', 'integrating', 'double-integrating'],
  parameters: ['controllerType', 'sensitivityPeakTarget', 'phaseMarginTarget_deg'],
  tune: migo,
};
