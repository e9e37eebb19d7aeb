/**
 * The plan: which loop, rule, breakpoints, interpolation, controller and acceptance limits a
 * schedule is built with. Every field has a documented default (PLAN_DEFAULTS), so `{}` is a plan.
 */
import { CONTROLLER_DEFAULTS, resolveControllerSettings } from '../controller/defaults.js';
import { SIMULATION_DEFAULTS } from '../performance/defaults.js';
import type { AntiWindup } from '../controller/firmware-step.js';
import type { Discretisation } from '../controller/types.js';
import type { TimeDomainLimits } from '../performance/types.js';
import { SpeedbandError } from '../core/errors.js';
import type { ControllerType, RuleName } from '../tuning/types.js';
import { planReferenceHint } from './plan-reference-path.js';
import type { InterpolationMethod } from './types.js';
import { resolveVariations, type PlanVariations, type WrittenVariations } from './plan-variations.js';

import type { SpeedTable } from '../core/by-speed.js';
import type { LoopKind, ReferencePoint } from '../loops/types.js';

export type { LoopKind, ReferencePoint };

export type { SpeedTable };
/** An expression in speed_mps (m/s), e.g. "max(15, 1.2 * speed_mps)" (src/core/speed-expression.ts). */
export type SpeedExpression = string;
/** A rule parameter that is one number at every speed, a SpeedTable, or a SpeedExpression. */
export type SpeedVarying = number | SpeedTable | SpeedExpression;

/** Rule parameters as written in a plan (names as in src/tuning/types.ts RuleParameters; numbers may vary with speed: rule-parameters.ts). */
export interface PlanRuleParameters {
  readonly controllerType?: ControllerType;
  readonly closedLoopTimeConstant_s?: SpeedVarying;
  readonly simcClosedLoopTimeConstant_s?: SpeedVarying;
  readonly dampingRatio?: SpeedVarying;
  readonly naturalFrequency_radps?: SpeedVarying;
  readonly settlingDistance_m?: SpeedVarying;
  readonly integralPoleRatio?: SpeedVarying;
  readonly sensitivityPeakTarget?: SpeedVarying;
  readonly phaseMarginTarget_deg?: SpeedVarying;
}

/**
 * How each breakpoint's rule parameter is chosen: 'rule-parameters' — as the plan gives it (or the rule's
 * default); 'fastest-passing' — a search over the rule's free parameter for the fastest response that
 * meets every acceptance limit at that breakpoint on the full loop (src/pipeline/fastest-passing.ts).
 */
export type TuneFor = 'rule-parameters' | 'fastest-passing';
/** What a fastest-passing search judges each candidate on: the nominal model, or the worst case over the plan's variations. */
export type SearchOn = 'nominal' | 'worst-case';

export type BreakpointPlan =
  | { readonly mode: 'explicit'; readonly speeds_mps: readonly number[] }
  | { readonly mode: 'automatic'; readonly count: number; readonly spacing: 'geometric' | 'linear' };

/** The acceptance limits at one speed (the plan's acceptance section with its tables and expressions read there). */
export interface AcceptanceAtSpeed extends TimeDomainLimits {
  readonly maximumLowerGainMargin_dB: number;
  readonly minimumUpperGainMargin_dB: number;
  readonly minimumPhaseMargin_deg: number;
  readonly maximumSensitivityPeak: number;
  readonly maximumComplementarySensitivityPeak: number;
  /** Required delay margin = latency (computation latency + half a sample for the hold) + this room, s. */
  readonly delayMarginRoom_s: number;
  /** Largest error while the speed changes through the range in a curve (the speed-ramp and braking scenarios), per loop unit. */
  readonly maximumSpeedChangeError_m: number;
  readonly maximumSpeedChangeError_rad: number;
  readonly maximumSpeedChangeError_radps: number;
}

/** A resolved plan: loop, rule and its parameters, speeds, breakpoints, interpolation, controller, acceptance limits, check. */
export interface Plan {
  readonly loop: {
    readonly kind: LoopKind;
    /** Path loop: preview distance ahead of the reference point at standstill, m. */
    readonly preview_m: number;
    /** Path loop: preview time, s: the preview is preview_m + previewTime_s·speed ahead of the reference point. */
    readonly previewTime_s: number;
    /** Path loop: where the preview is measured from (front-axle adds the CG-to-front-axle distance a). */
    readonly referencePoint: ReferencePoint;
  };
  readonly rule: { readonly name: RuleName; readonly parameters: PlanRuleParameters; readonly tuneFor: TuneFor; readonly searchOn: SearchOn };
  readonly speeds: {
    /** The dense check covers minimum_mps … maximum_mps. */
    readonly minimum_mps: number;
    readonly maximum_mps: number;
    /** Below this speed the floor's gains are used; automatic breakpoints start here (or at minimum_mps if higher). */
    readonly lowSpeedFloor_mps: number;
  };
  readonly breakpoints: BreakpointPlan;
  readonly interpolation: InterpolationMethod;
  readonly controller: {
    /** Gains are stored in parallel form u = kp·e + ki·∫e + kd·ė_filtered. */
    readonly form: 'parallel';
    readonly derivativeFilter: number;
    readonly sampleTime_s: number;
    readonly discretisation: Discretisation;
    readonly computationLatency_s: number;
    /** How the integrator is kept from winding up while the command is at the steering-angle limit. */
    readonly antiWindup: AntiWindup;
  };
  /** Acceptance limits: each one number, a table over speed or an expression in speed_mps (acceptance-limits.ts reads them). */
  readonly acceptance: { readonly [K in keyof AcceptanceAtSpeed]: SpeedVarying };
  readonly check: {
    /** Evenly spaced check speeds across the range (breakpoints and midpoints are added). */
    readonly gridSpeeds: number;
    readonly maxInsertedBreakpoints: number;
    /** Model the dense check runs on: the joint single-track fit, or lumped models interpolated between test speeds. */
    readonly model: 'single-track' | 'interpolated-lumped';
    /** Run the scenarios (src/performance/scenario-catalogue.ts) at each breakpoint, at low, middle and top speed and through the range, and judge them. */
    readonly scenarios: boolean;
    /** The speed changes through the range the scenarios judge: speed-ramp-in-curve's acceleration and braking-in-curve's deceleration, m/s². */
    readonly rampAcceleration_mps2: number;
    readonly brakingDeceleration_mps2: number;
  };
  /** The vehicles the schedule must hold on besides the nominal model (plan-variations.ts); absent: nominal check only. */
  readonly variations?: PlanVariations;
}

/** A plan as written in a file: every field optional. */
export type PartialPlan = {
  readonly [K in keyof Plan]?: K extends 'breakpoints'
    ? { readonly speeds_mps?: readonly number[]; readonly count?: number; readonly spacing?: 'geometric' | 'linear' }
    : K extends 'interpolation'
      ? InterpolationMethod
      : K extends 'variations'
        ? WrittenVariations
        : Partial<Plan[K]>;
} & { readonly $schema?: string; readonly description?: string };

/** The acceptance limits when the plan gives none (sources: PLAN_DEFAULTS). */
export const ACCEPTANCE_DEFAULTS: AcceptanceAtSpeed = {
  maximumLowerGainMargin_dB: -6,
  minimumUpperGainMargin_dB: 6,
  minimumPhaseMargin_deg: 45,
  maximumSensitivityPeak: 2,
  maximumComplementarySensitivityPeak: 2,
  delayMarginRoom_s: 0.02,
  maximumOvershoot_pct: 25,
  maximumRecoveryTime_s: 15,
  maximumLaneChangeError_m: 0.5,
  maximumCurveEntryError_m: 0.3,
  maximumSpeedChangeError_m: 0.3,
  maximumSpeedChangeError_rad: 0.05,
  maximumSpeedChangeError_radps: 0.05,
};

/**
 * Defaults, in one place. Sources: acceptance limits common practice (docs/domain.md §5: GM ≥ 6 dB both ways,
 * PM ≥ 45°, Ms ≤ 2; Åström & Hägglund 2006, Advanced PID Control, §4.8, give Ms 1.2–2 as the usual range); Mt ≤ 2
 * (6 dB), the same bound as Ms — Skogestad & Postlethwaite (2005, Multivariable Feedback Control, §2.4.3)
 * suggest about 1.25 for a well-damped reference response (from memory); the overshoot limit judges that
 * directly; overshoot ≤ 25 % (common practice); disturbances removed to 5 % within 15 s, a lane-change
 * error ≤ 0.5 m (half the clearance of a 2.5 m wide vehicle in a 3.5 m lane) and a curve-entry error
 * ≤ 0.3 m 3 s after entry (our choices, the product's targets for lateral control); while the speed changes
 * through the range in a curve, an error ≤ 0.3 m (path: the curve-entry limit), ≤ 0.05 rad ≈ 3° (heading) or
 * ≤ 0.05 rad/s (yaw rate) (our choices), and no sustained oscillation in any scenario (common practice); derivative filter
 * N = 10 common practice; backward Euler because its derivative-filter pole stays in [0, 1); conditional
 * integration (Åström & Hägglund 2006, §3.5: no parameter to tune). The rule per loop kind: DEFAULT_RULES.
 * Our choices: speed range 1–20 m/s (the test speeds when there are any) with the floor at its bottom, 6 geometric breakpoints (gains change
 * fastest at low speed), 100 Hz firmware (or the vehicle file's sample time) with one sample of computation latency, 20 ms delay-margin
 * room, 200 check speeds, at most 8 inserted breakpoints, monotone cubic interpolation.
 */
export const PLAN_DEFAULTS: Plan = {
  loop: { kind: 'yaw-rate', preview_m: 0, previewTime_s: 0, referencePoint: 'front-axle' },
  rule: { name: 'simc', parameters: {}, tuneFor: 'rule-parameters', searchOn: 'nominal' },
  speeds: { minimum_mps: 1, maximum_mps: 20, lowSpeedFloor_mps: 1 },
  breakpoints: { mode: 'automatic', count: 6, spacing: 'geometric' },
  interpolation: 'monotone-cubic',
  controller: { form: 'parallel', ...CONTROLLER_DEFAULTS, antiWindup: 'conditional-integration' },
  acceptance: ACCEPTANCE_DEFAULTS,
  check: {
    gridSpeeds: 200,
    maxInsertedBreakpoints: 8,
    model: 'single-track',
    scenarios: true,
    rampAcceleration_mps2: SIMULATION_DEFAULTS.rampAcceleration_mps2,
    brakingDeceleration_mps2: SIMULATION_DEFAULTS.brakingDeceleration_mps2,
  },
};

/**
 * The rule, its parameters and how they are chosen when the plan names no rule, per loop kind — each
 * builds schedules that pass on every demo vehicle (test/pipeline/default-plans.test.ts):
 *   yaw-rate: SIMC with τc = θ (Skogestad 2003), as given;
 *   heading:  SIMC, τc searched for the fastest response within the limits;
 *   path:     MIGO (Åström, Panagopoulos & Hägglund 1998) on the full loop, M searched likewise.
 */
export const DEFAULT_RULES: Readonly<Record<LoopKind, Plan['rule']>> = {
  'yaw-rate': { name: 'simc', parameters: {}, tuneFor: 'rule-parameters', searchOn: 'nominal' },
  heading: { name: 'simc', parameters: {}, tuneFor: 'fastest-passing', searchOn: 'nominal' },
  path: { name: 'migo', parameters: {}, tuneFor: 'fastest-passing', searchOn: 'nominal' },
};

/**
 * The path loop's preview when the plan gives neither distance nor time: 0.5 m + 0.3 s × speed ahead of the
 * front axle (our choice: a look-ahead that grows with speed — common practice in path following — sized so
 * the default path plan passes on every demo vehicle, from a 0.5 m/s robot to a 25 m/s van).
 */
export const DEFAULT_PATH_PREVIEW = { preview_m: 0.5, previewTime_s: 0.3 } as const;

function planError(message: string, jsonPath: string, file?: string): SpeedbandError {
  return new SpeedbandError('plan.invalid', `${message}\n${planReferenceHint()}`, { location: { file, jsonPath } });
}

function checkSpeedTable(value: SpeedVarying | undefined, jsonPath: string, file?: string): void {
  if (value === undefined || typeof value !== 'object') return;
  if (value.speeds_mps.length !== value.values.length) {
    throw planError(`${value.speeds_mps.length} speeds but ${value.values.length} values — give one value per speed`, jsonPath, file);
  }
  for (let i = 1; i < value.speeds_mps.length; i += 1) {
    if (!(value.speeds_mps[i] > value.speeds_mps[i - 1])) {
      throw planError(
        `speeds must increase strictly: ${value.speeds_mps[i - 1]} then ${value.speeds_mps[i]} m/s — sort them and remove duplicates`,
        `${jsonPath}/speeds_mps/${i}`,
        file,
      );
    }
  }
}

/** Options for resolvePlan beyond the plan itself. */
export interface ResolveContext {
  /** Speeds of the step tests, m/s: when the plan gives no speed range, the check covers their range. */
  readonly testSpeeds_mps?: readonly number[];
  /** File name for error locations. */
  readonly file?: string;
  /** The vehicle file's controllerSampleTime_s: the sample time when the plan gives none. */
  readonly vehicleSampleTime_s?: number;
  /** The vehicle file's serviceAcceleration_mps2 and serviceDeceleration_mps2: the scenarios' speed changes when the plan gives none. */
  readonly vehicleServiceAcceleration_mps2?: number;
  readonly vehicleServiceDeceleration_mps2?: number;
}

/**
 * Plausible ranges of the controller settings (the schema only asks for positive numbers): a steering
 * controller runs at 1 Hz to 10 kHz, computes within a second and filters its derivative with N from 1
 * to 1,000 (common practice: 5–20). Outside them the numbers are a unit slip (ms in an s field) or a typo,
 * and the loop analysis would spend its time on a delay register of millions of samples.
 */
export const CONTROLLER_RANGES = {
  sampleTime_s: { minimum: 1e-4, maximum: 1, words: 'from 0.0001 s (10 kHz) to 1 s', advice: 'give the controller period in seconds, e.g. 0.01 for 100 Hz' },
  computationLatency_s: {
    minimum: 0,
    maximum: 1,
    words: 'from 0 s to 1 s',
    advice: 'give the time from sampling to the steering command in seconds, e.g. 0.01 (not milliseconds)',
  },
  derivativeFilter: { minimum: 1, maximum: 1000, words: 'from 1 to 1,000', advice: 'N sets the derivative filter time Td/N; 5–20 is common practice' },
} as const;

function checkControllerPlausible(controller: Plan['controller'], written: Partial<Plan['controller']>, file?: string): void {
  for (const [field, range] of Object.entries(CONTROLLER_RANGES) as [
    keyof typeof CONTROLLER_RANGES,
    (typeof CONTROLLER_RANGES)[keyof typeof CONTROLLER_RANGES],
  ][]) {
    const value = controller[field];
    if (value >= range.minimum && value <= range.maximum) continue;
    const where = written[field] === undefined && field === 'sampleTime_s' ? " (taken from the vehicle file's controllerSampleTime_s)" : '';
    throw planError(`controller.${field} is ${value}${where} — expected ${range.words}: ${range.advice}`, `/controller/${field}`, file);
  }
}

/**
 * Apply PLAN_DEFAULTS section by section and check what a schema cannot: range order, the floor
 * inside the range, explicit breakpoints strictly increasing, speed tables well formed.
 * A partial plan should be schema-valid already (readPlan validates; library callers are typed).
 */
export function resolvePlan(partial: PartialPlan, context: ResolveContext = {}): Plan {
  const file = context.file;
  const tests = context.testSpeeds_mps ?? [];
  const fromTests = tests.length >= 2 ? { minimum_mps: Math.min(...tests), maximum_mps: Math.max(...tests) } : {};
  const speeds = { ...PLAN_DEFAULTS.speeds, ...fromTests, ...partial.speeds };
  // Unless the plan sets it, the floor is the bottom of the range (the lowest test speed by default):
  // a fixed floor would leave a slow vehicle's whole range (a 0.5–3 m/s robot) under one set of gains.
  if (partial.speeds?.lowSpeedFloor_mps === undefined) {
    speeds.lowSpeedFloor_mps = speeds.minimum_mps;
  }
  if (!(speeds.maximum_mps > speeds.minimum_mps)) {
    throw planError(`the speed range is ${speeds.minimum_mps} to ${speeds.maximum_mps} m/s — the maximum must be above the minimum`, '/speeds', file);
  }
  if (!(speeds.lowSpeedFloor_mps < speeds.maximum_mps)) {
    throw planError(
      `the low-speed floor ${speeds.lowSpeedFloor_mps} m/s is not below the range maximum ${speeds.maximum_mps} m/s — lower the floor`,
      '/speeds/lowSpeedFloor_mps',
      file,
    );
  }
  let breakpoints: BreakpointPlan = PLAN_DEFAULTS.breakpoints;
  const written = partial.breakpoints;
  if (written?.speeds_mps !== undefined) {
    written.speeds_mps.forEach((speed, i) => {
      if (i > 0 && !(speed > written.speeds_mps![i - 1])) {
        throw planError(
          `breakpoint speeds must increase strictly: ${written.speeds_mps![i - 1]} then ${speed} m/s — sort them and remove duplicates`,
          `/breakpoints/speeds_mps/${i}`,
          file,
        );
      }
    });
    breakpoints = { mode: 'explicit', speeds_mps: written.speeds_mps };
  } else if (written !== undefined) {
    breakpoints = { mode: 'automatic', count: written.count ?? 6, spacing: written.spacing ?? 'geometric' };
  }
  // Sample time: the plan's, else the vehicle file's, else the default; latency: the plan's, else one sample (as tune and stability).
  const controller = {
    form: 'parallel' as const,
    ...resolveControllerSettings(partial.controller ?? {}, context.vehicleSampleTime_s),
    antiWindup: partial.controller?.antiWindup ?? PLAN_DEFAULTS.controller.antiWindup,
  };
  checkControllerPlausible(controller, partial.controller ?? {}, file);
  const parameters = partial.rule?.parameters ?? PLAN_DEFAULTS.rule.parameters;
  for (const [name, value] of Object.entries(parameters)) checkSpeedTable(value as SpeedVarying, `/rule/parameters/${name}`, file);
  for (const [name, value] of Object.entries(partial.acceptance ?? {})) checkSpeedTable(value as SpeedVarying, `/acceptance/${name}`, file);
  const kind = partial.loop?.kind ?? PLAN_DEFAULTS.loop.kind;
  const previewGiven = partial.loop?.preview_m !== undefined || partial.loop?.previewTime_s !== undefined;
  const loop = { ...PLAN_DEFAULTS.loop, ...(kind === 'path' && !previewGiven ? DEFAULT_PATH_PREVIEW : {}), ...partial.loop };
  // No rule named: the loop kind's default rule, parameters and search; a rule named: as the plan says.
  const chosen =
    partial.rule?.name === undefined
      ? {
          ...DEFAULT_RULES[kind],
          ...(partial.rule?.parameters === undefined ? {} : { parameters }),
          ...(partial.rule?.tuneFor === undefined ? {} : { tuneFor: partial.rule.tuneFor }),
        }
      : { name: partial.rule.name, parameters, tuneFor: partial.rule.tuneFor ?? PLAN_DEFAULTS.rule.tuneFor };
  const variations = partial.variations === undefined ? undefined : resolveVariations(partial.variations, controller.sampleTime_s);
  const rule = { ...chosen, searchOn: resolveSearchOn(partial.rule?.searchOn, chosen.tuneFor, variations, file) };
  return {
    loop,
    rule,
    speeds,
    breakpoints,
    interpolation: partial.interpolation ?? PLAN_DEFAULTS.interpolation,
    controller,
    acceptance: { ...PLAN_DEFAULTS.acceptance, ...partial.acceptance },
    // The speed changes the scenarios judge: the plan's, else the ones the vehicle file says it uses in service, else ours.
    check: {
      ...PLAN_DEFAULTS.check,
      ...(context.vehicleServiceAcceleration_mps2 === undefined ? {} : { rampAcceleration_mps2: context.vehicleServiceAcceleration_mps2 }),
      ...(context.vehicleServiceDeceleration_mps2 === undefined ? {} : { brakingDeceleration_mps2: context.vehicleServiceDeceleration_mps2 }),
      ...partial.check,
    },
    ...(variations === undefined ? {} : { variations }),
  };
}

/**
 * What a fastest-passing search judges its candidates on: as written; else the worst case when the plan's
 * variations are accepted robustly (the search then aims at what the schedule must pass), the nominal model otherwise.
 */
function resolveSearchOn(written: SearchOn | undefined, tuneFor: TuneFor, variations: PlanVariations | undefined, file: string | undefined): SearchOn {
  if (written !== undefined && tuneFor !== 'fastest-passing') {
    throw new SpeedbandError(
      'plan.invalid',
      `rule.searchOn is "${written}", but the rule's parameters are not searched (tuneFor "${tuneFor}") — remove rule.searchOn, or set rule.tuneFor to "fastest-passing"`,
      {
        location: { file, jsonPath: '/rule/searchOn' },
      },
    );
  }
  if (written === 'worst-case' && variations === undefined) {
    throw new SpeedbandError(
      'plan.invalid',
      'rule.searchOn is "worst-case", but the plan has no variations section to take the worst case over — add "variations" (even {} for the defaults), or search on the nominal model',
      {
        location: { file, jsonPath: '/rule/searchOn' },
      },
    );
  }
  return written ?? (tuneFor === 'fastest-passing' && variations?.acceptance === 'robust' ? 'worst-case' : 'nominal');
}

/**
 * Breakpoint speeds, m/s, strictly increasing. Explicit: as written. Automatic: `count` speeds from
 * max(lowSpeedFloor, minimum) to maximum, geometric v_i = v0·(v1/v0)^(i/(n−1)) or linear; ends exact.
 */
export function planBreakpoints(plan: Plan): number[] {
  if (plan.breakpoints.mode === 'explicit') return [...plan.breakpoints.speeds_mps];
  const first = Math.max(plan.speeds.lowSpeedFloor_mps, plan.speeds.minimum_mps);
  const last = plan.speeds.maximum_mps;
  const n = plan.breakpoints.count;
  if (n === 1) return [first];
  const speeds: number[] = [];
  for (let i = 0; i < n; i += 1) {
    const fraction = i / (n - 1);
    speeds.push(plan.breakpoints.spacing === 'geometric' ? first * Math.pow(last / first, fraction) : first + (last - first) * fraction);
  }
  speeds[0] = first;
  speeds[n - 1] = last;
  return speeds;
}

/**
 * The speed changes through the range the scenarios judge (scenario-catalogue.ts sizes), from a resolved plan — or
 * from the plan a schedule records: one written before the plan had them gets the defaults it was built with.
 */
export function planSpeedChanges(plan: Pick<Plan, 'check'> | { readonly check?: Partial<Plan['check']> }): {
  readonly acceleration_mps2: number;
  readonly deceleration_mps2: number;
} {
  return {
    acceleration_mps2: plan.check?.rampAcceleration_mps2 ?? PLAN_DEFAULTS.check.rampAcceleration_mps2,
    deceleration_mps2: plan.check?.brakingDeceleration_mps2 ?? PLAN_DEFAULTS.check.brakingDeceleration_mps2,
  };
}
