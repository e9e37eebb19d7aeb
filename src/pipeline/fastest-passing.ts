/**
 * tuneFor "fastest-passing": at one breakpoint, the value of the rule's free parameter that gives the
 * fastest response meeting every acceptance limit on the full loop as the firmware runs it (margins both
 * ways, Ms, Mt, delay margin and the time-domain limits; breakpoint-evaluation.ts). The candidates run from
 * fast to slow (the frequency-domain limits moved inside by SEARCH_ROOM) on a geometric ladder around the rule's own default (SIMC and IMC τc/λ from 0.25θ to 16θ,
 * damping-target ωn from 8× to ⅛× its default, MIGO's M from the plan's sensitivity limits down to 1.2 in
 * steps of 0.1, the plan's phase-margin limit kept as a constraint of the optimisation);
 * the first that passes is refined by bisection towards the last faster one that failed. The feasible set
 * need not be an interval (too fast breaks margins, too slow breaks recovery times): the ladder is what
 * finds its fast end. When no candidate passes, the one breaking the fewest limits (a stable one first,
 * the slower of equals) is used, and the schedule fails on it.
 */
import type { PidGains } from '../controller/types.js';
import { SpeedbandError, isSpeedbandError } from '../core/errors.js';
import type { ScheduleSearchAt } from '../schedule/schedule-types.js';
import type { TunedOperatingPoint } from '../tuning/operating-point.js';
import type { RuleName, RuleParameters } from '../tuning/types.js';
import type { BreakpointEvaluation } from './breakpoint-evaluation.js';
import type { AcceptanceThresholds } from '../schedule/types.js';
import { mapOverSpeed, type OverSpeed } from '../core/by-speed.js';

/** A rule's free parameter: its name, which way is faster, and the ladder of candidates from a tune at the rule's default. */
interface FreeParameter {
  readonly name: keyof RuleParameters & string;
  /** Other names that set the same thing (a plan giving one of them cannot also ask for the search). */
  readonly alsoSetBy: readonly (keyof RuleParameters & string)[];
  readonly symbol: string;
  /** Candidates, fastest first, from the default tune. */
  readonly ladder: (defaultTune: () => TunedOperatingPoint, limits: { readonly sensitivity: number; readonly complementary: number }) => number[];
  /** Bisection between two candidates: geometric for times and frequencies, arithmetic for M. */
  readonly geometric: boolean;
  /** Parameters the search sets besides the free one (when the plan does not): MIGO keeps the plan's phase margin. */
  readonly companions?: (input: FastestPassingInput) => RuleParameters;
}

const RATIOS = [0.25, 0.35, 0.5, 0.7, 1, 1.4, 2, 2.8, 4, 5.7, 8, 11, 16];
const deadTime = (tuned: TunedOperatingPoint): number => Math.max(tuned.derivation.designModel.deadTime_s, 1e-3);

export const FREE_PARAMETERS: Partial<Record<RuleName, FreeParameter>> = {
  simc: { name: 'simcClosedLoopTimeConstant_s', alsoSetBy: [], symbol: 'τc', ladder: (t) => RATIOS.map((r) => r * deadTime(t())), geometric: true },
  'imc-pid': { name: 'closedLoopTimeConstant_s', alsoSetBy: [], symbol: 'λ', ladder: (t) => RATIOS.map((r) => r * deadTime(t())), geometric: true },
  'damping-target': {
    name: 'naturalFrequency_radps',
    alsoSetBy: ['settlingDistance_m'],
    symbol: 'ωn',
    ladder: (t) => {
      const omega = t().derivation.intermediate.naturalFrequency_radps ?? 1;
      return RATIOS.map((r) => (2 * omega) / r);
    },
    geometric: true,
  },
  migo: {
    name: 'sensitivityPeakTarget',
    alsoSetBy: [],
    symbol: 'M',
    ladder: (_t, limits) => {
      const top = Math.min(limits.sensitivity, limits.complementary);
      const values: number[] = [];
      for (let m = top; m >= 1.2 - 1e-9; m -= 0.1) values.push(Number(m.toFixed(6)));
      return values.length > 0 ? values : [top];
    },
    geometric: false,
    companions: (input) => (input.parameters.phaseMarginTarget_deg === undefined ? { phaseMarginTarget_deg: input.phaseMarginLimit_deg } : {}),
  },
};

const BISECTION_STEPS = 4;

/**
 * The search aims this far inside the frequency-domain limits: the dense check then judges the gains
 * interpolated between breakpoints, which a design exactly on a limit at both ends can break by a hair in
 * between (our choice). The time-domain limits are judged at the breakpoints only, on the gains searched: no room.
 */
export const SEARCH_ROOM = { phaseMargin_deg: 1, gainMargin_dB: 0.5, peakFactor: 0.99, delayMarginFactor: 1.05 } as const;

/** How far a search aims inside the frequency-domain limits. */
export type SearchRoom = { readonly phaseMargin_deg: number; readonly gainMargin_dB: number; readonly peakFactor: number; readonly delayMarginFactor: number };

/** The frequency-domain limits moved inside by `room`. */
export function thresholdsWithRoom(thresholds: OverSpeed<AcceptanceThresholds>, room: SearchRoom): OverSpeed<AcceptanceThresholds> {
  return {
    maximumLowerGainMargin_dB: mapOverSpeed(thresholds.maximumLowerGainMargin_dB, (limit) => limit - room.gainMargin_dB),
    minimumUpperGainMargin_dB: mapOverSpeed(thresholds.minimumUpperGainMargin_dB, (limit) => limit + room.gainMargin_dB),
    minimumPhaseMargin_deg: mapOverSpeed(thresholds.minimumPhaseMargin_deg, (limit) => limit + room.phaseMargin_deg),
    maximumSensitivityPeak: mapOverSpeed(thresholds.maximumSensitivityPeak, (limit) => Math.max(1, limit * room.peakFactor)),
    maximumComplementarySensitivityPeak: mapOverSpeed(thresholds.maximumComplementarySensitivityPeak, (limit) => Math.max(1, limit * room.peakFactor)),
    minimumDelayMargin_s: mapOverSpeed(thresholds.minimumDelayMargin_s, (limit) => limit * room.delayMarginFactor),
  };
}

/** Acceptance limits moved inside by SEARCH_ROOM. */
export function limitsWithRoom<L>(thresholds: OverSpeed<AcceptanceThresholds>, limits: L): { thresholds: OverSpeed<AcceptanceThresholds>; limits: L } {
  return {
    thresholds: thresholdsWithRoom(thresholds, SEARCH_ROOM),
    limits,
  };
}

export interface FastestPassingInput {
  readonly rule: RuleName;
  readonly speed_mps: number;
  /** The plan's parameters at this speed (without the free one). */
  readonly parameters: RuleParameters;
  readonly tune: (parameters: RuleParameters, startGains?: PidGains) => TunedOperatingPoint;
  readonly evaluate: (gains: PidGains) => BreakpointEvaluation;
  readonly sensitivityLimits: { readonly sensitivity: number; readonly complementary: number };
  /** The phase margin the search aims for (the plan's limit with SEARCH_ROOM), degrees. */
  readonly phaseMarginLimit_deg: number;
}

export interface FastestPassingResult {
  readonly tuned: TunedOperatingPoint;
  readonly evaluation: BreakpointEvaluation;
  readonly record: ScheduleSearchAt;
}

/** The rule's free parameter, or `build.noFreeParameter` naming the rules that have one. */
export function freeParameterOf(rule: RuleName): FreeParameter {
  const free = FREE_PARAMETERS[rule];
  if (free === undefined) {
    throw new SpeedbandError(
      'plan.invalid',
      `rule ${rule} has no free parameter to search ("tuneFor": "fastest-passing") — use it with "tuneFor": "rule-parameters", or a rule with one: ${Object.keys(FREE_PARAMETERS).join(', ')}`,
      { location: { jsonPath: '/rule/tuneFor' }, details: { rule } },
    );
  }
  return free;
}

const shown = (value: number): string => String(Number(value.toPrecision(3)));

export function fastestPassing(input: FastestPassingInput): FastestPassingResult {
  const free = freeParameterOf(input.rule);
  const parameters: RuleParameters = { ...input.parameters, ...(free.companions?.(input) ?? {}) };
  const ladder = free.ladder(() => input.tune(parameters), input.sensitivityLimits);
  type Tried = { value: number; tuned: TunedOperatingPoint | null; evaluation: BreakpointEvaluation | null; refusal: string | null };
  let previousGains: PidGains | undefined;
  let candidates = 0;
  const attempt = (value: number): Tried => {
    candidates++;
    try {
      const tuned = input.tune({ ...parameters, [free.name]: value }, previousGains);
      previousGains = tuned.gains;
      return { value, tuned, evaluation: input.evaluate(tuned.gains), refusal: null };
    } catch (error) {
      if (!isSpeedbandError(error) || !error.code.startsWith('tuning.')) throw error;
      return { value, tuned: null, evaluation: null, refusal: error.message };
    }
  };
  const passes = (tried: Tried): boolean => tried.evaluation !== null && tried.evaluation.severity === 0;
  const tried: Tried[] = [];
  let passing: Tried | null = null;
  let fasterFailing: Tried | null = null;
  for (const value of ladder) {
    const result = attempt(value);
    tried.push(result);
    if (passes(result)) {
      passing = result;
      break;
    }
    fasterFailing = result;
  }
  const why = (t: Tried): string => (t.refusal !== null ? `the rule refuses (${t.refusal})` : (t.evaluation?.failures ?? []).join('; '));
  if (passing !== null) {
    let failing = fasterFailing;
    for (let i = 0; failing !== null && i < BISECTION_STEPS; i++) {
      const middle = free.geometric ? Math.sqrt(failing.value * passing.value) : (failing.value + passing.value) / 2;
      const result = attempt(middle);
      if (passes(result)) passing = result;
      else failing = result;
    }
    return {
      tuned: passing.tuned as TunedOperatingPoint,
      evaluation: passing.evaluation as BreakpointEvaluation,
      record: {
        speed_mps: input.speed_mps,
        parameter: free.name,
        value: passing.value,
        outcome: 'fastest passing',
        candidates,
        reason:
          failing === null
            ? `${free.symbol} = ${shown(passing.value)}, the fastest candidate, meets every limit`
            : `${free.symbol} = ${shown(passing.value)} meets every limit; ${free.symbol} = ${shown(failing.value)} (faster) does not: ${why(failing)}`,
      },
    };
  }
  // Nothing passed: the candidate breaking the fewest limits, a stable one first, the slower of equals.
  let closest: Tried | null = null;
  for (const t of tried) {
    if (t.evaluation === null) continue;
    if (closest === null || (closest.evaluation as BreakpointEvaluation).severity >= t.evaluation.severity) closest = t;
  }
  if (closest === null) {
    throw new SpeedbandError(
      'tuning.ruleNotApplicable',
      `tuning at ${input.speed_mps.toFixed(2)} m/s: rule ${input.rule} refused every ${free.symbol} tried (${shown(ladder[0])} … ${shown(ladder[ladder.length - 1])}): ${why(tried[tried.length - 1])}`,
      {
        details: { rule: input.rule, speed_mps: input.speed_mps },
      },
    );
  }
  return {
    tuned: closest.tuned as TunedOperatingPoint,
    evaluation: closest.evaluation as BreakpointEvaluation,
    record: {
      speed_mps: input.speed_mps,
      parameter: free.name,
      value: closest.value,
      outcome: 'none passed',
      candidates,
      reason: `no ${free.symbol} from ${shown(ladder[0])} to ${shown(ladder[ladder.length - 1])} meets every limit; ${free.symbol} = ${shown(closest.value)} comes closest: ${why(closest)}`,
    },
  };
}
