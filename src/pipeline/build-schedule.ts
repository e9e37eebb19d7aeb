/**
 * The main job: logs + vehicle (+ plan) → identified models → gains at each breakpoint by the
 * plan's rule → interpolated table → dense check at every grid speed with the discrete controller
 * → bounded breakpoint refinement → with the plan's variations, the worst case over them at every grid
 * speed → schedule file (not written here; see writeSchedule).
 */
import { readFileSync } from 'node:fs';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import { fastestPassing, freeParameterOf, limitsWithRoom } from './fastest-passing.js';
import { scenarioParameters } from './simulate-schedule.js';
import { scenarioStage, startScenarioHelper } from './scenario-stage.js';
import { SEARCH_SCENARIOS } from '../performance/breakpoint-scenarios.js';
import { makeBreakpointEvaluator, type BreakpointEvaluation } from './breakpoint-evaluation.js';
import type { BreakpointExtras } from '../schedule/schedule-file.js';
import type { ScheduleSearchAt } from '../schedule/schedule-types.js';
import type { RuleParameters } from '../tuning/types.js';
import { SpeedbandError } from '../core/errors.js';
import { sha256Hex } from '../core/files.js';
import type { IdentifyOptions } from '../identify/defaults.js';
import { identifyFromLogs } from '../identify/identify-from-logs.js';
import type { ModelsFile } from '../identify/models-schema.js';
import type { ReadLogOptions } from '../log/read.js';
import type { Vehicle } from '../vehicle/types.js';
import type { LoopSpecification } from '../loops/types.js';
import { planSpeedChanges, resolvePlan, type PartialPlan, type Plan } from '../schedule/plan.js';
import { readPlanFile } from '../schedule/plan-file.js';
import { acceptanceLimits, compileAcceptanceExpressions } from '../schedule/acceptance-limits.js';
import { atSpeed as readAtSpeed } from '../core/by-speed.js';
import { makeWorstCaseEvaluator } from './worst-case-evaluation.js';
import type { RobustScheduleCheck } from './robust-schedule-check.js';
import type { TimeDomainSettings } from './robust-time-domain.js';
import { checkTableOverVariations, planRobustContext, withRobustWeights } from './build-robust.js';
import type { RefineResult } from '../schedule/refine.js';
import { assembleSchedule } from '../schedule/schedule-file.js';
import { makeRuleParameterLookup } from '../schedule/rule-parameters.js';
import { scheduleGains } from '../schedule/schedule-gains.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { ProgressCallback } from '../schedule/types.js';
import { tuneOperatingPoint, type TunedOperatingPoint } from '../tuning/operating-point.js';
import { loadVehicle, resolveVehiclePath } from '../vehicle/load.js';
import { checkModelFromModels, type CheckModel } from './check-model.js';
import { modelDelay_s, requireBoundedDelay } from './delay-bound.js';
import { makeLoopAnalysis } from './loop-analysis.js';
import { extrapolationAt, type Extrapolation } from './extrapolation.js';
import { quoted } from '../core/quote.js';
import { basename } from 'node:path';

/** Identification options `build` overrides: only the FOPDT and joint single-track fits feed a schedule. */
export const BUILD_IDENTIFY_OPTIONS: Partial<IdentifyOptions> = { fitSecondOrder: false };

/** Input of buildSchedule: vehicle file, logs (or models), plan file or object, how to read the logs, progress. */
export interface BuildInput {
  /** Vehicle file, or a folder holding vehicle.json. */
  readonly vehicle: string;
  /** Step-test logs (CSV). Ignored when `models` is given. */
  readonly logPaths: readonly string[];
  /** Identification already done (e.g. read from models.json); skips reading the logs. */
  readonly models?: ModelsFile;
  /** A plan file path; or `plan`, a plan object; neither: every default. */
  readonly planFile?: string;
  readonly plan?: PartialPlan;
  /** How to read the logs (column names and units). */
  readonly readOptions?: ReadLogOptions;
  /** Progress lines for long runs. */
  readonly progress?: (text: string) => void;
  /**
   * Accept `models` identified with another vehicle file (default false: `build.otherVehicle`). The joint
   * fit's stiffnesses were fitted with that file's mass, inertia and geometry.
   */
  readonly allowOtherVehicle?: boolean;
}

/** What buildSchedule returns: the schedule file (not written), the models, the resolved plan, the check model, the refinement, each breakpoint's derivation and figures. */
export interface BuildResult {
  readonly schedule: ScheduleFile;
  readonly models: ModelsFile;
  readonly plan: Plan;
  readonly checkModel: CheckModel;
  readonly refinement: RefineResult;
  /** The rule's derivation at each final breakpoint (gains, design model, intermediate quantities, warnings). */
  readonly tuned: readonly TunedOperatingPoint[];
  /** Breakpoints outside the tested speeds: how far, and their gains against those at the nearest test speed. */
  readonly extrapolations: readonly Extrapolation[];
  /** At each final breakpoint: margins, time-domain figures and the limits broken. */
  readonly evaluations: readonly BreakpointEvaluation[];
  /** With the plan's variations: the robust check of the final table and its record in the schedule. */
  readonly robust?: RobustScheduleCheck;
}

/** A tuning error at one speed, with that speed in its words and details (a plan's parameters may vary with speed). */
function atSpeed(error: unknown, speed_mps: number): unknown {
  if (!(error instanceof SpeedbandError) || error.code === 'plan.invalid') return error;
  return new SpeedbandError(error.code, `tuning at ${speed_mps.toFixed(2)} m/s: ${error.message}`, {
    location: error.location,
    details: { ...error.details, speed_mps },
    cause: error,
  });
}

/** Loop specification and controller settings of a plan, in the tuning and loop code's records. */
export function planLoopAndController(plan: Plan): { loop: LoopSpecification; controller: ControllerSettings } {
  return {
    loop: {
      kind: plan.loop.kind,
      preview_m: plan.loop.preview_m,
      ...(plan.loop.previewTime_s === 0 ? {} : { previewTime_s: plan.loop.previewTime_s }),
      referencePoint: plan.loop.referencePoint,
    },
    controller: {
      derivativeFilter: plan.controller.derivativeFilter,
      sampleTime_s: plan.controller.sampleTime_s,
      discretisation: plan.controller.discretisation,
      computationLatency_s: plan.controller.computationLatency_s,
    },
  };
}

/**
 * What `buildScheduleFromData` needs, loaded: the vehicle and its file's name and hash, the models (identified
 * or read), the plan as written. The names of the files stay, for provenance and error locations.
 */
export type LoadedBuildInput = Omit<BuildInput, 'vehicle' | 'logPaths' | 'models' | 'plan' | 'readOptions'> & {
  readonly vehicle: Vehicle;
  /** The vehicle file's path and SHA-256, as the schedule's provenance records them. */
  readonly vehicleFile: string;
  readonly vehicleSha256: string;
  readonly models: ModelsFile;
  /** The plan as written (every field optional), and the SHA-256 of its file when it came from one. */
  readonly plan: PartialPlan;
  readonly planSha256?: string;
};

/**
 * Build a checked schedule from files: reads the vehicle and plan files, identifies the logs (unless models are
 * given), then `buildScheduleFromData`. Deterministic: the same inputs and plan give the same schedule.
 * Throws SpeedbandError for bad input (logs, vehicle, plan) and `tuning.ruleNotApplicable` when the
 * plan's rule does not cover the loop. A schedule that fails its dense check is returned with
 * status 'failed'; the caller decides whether to write it.
 */
export async function buildSchedule(input: BuildInput): Promise<BuildResult> {
  const vehicleFile = resolveVehiclePath(input.vehicle);
  const vehicle = loadVehicle(vehicleFile);
  const vehicleSha256 = sha256Hex(readFileSync(vehicleFile));
  const plan: PartialPlan = input.planFile !== undefined ? readPlanFile(input.planFile) : (input.plan ?? {});
  const planSha256 = input.planFile === undefined ? undefined : sha256Hex(readFileSync(input.planFile));
  // A plan's expressions are compiled (and refused) before the logs are identified: a plan error comes at once.
  await makeRuleParameterLookup(plan.rule?.parameters ?? {}, input.planFile);
  await compileAcceptanceExpressions(plan, input.planFile);
  // The schedule uses the joint single-track fit (or the per-speed FOPDT when that is refused), never the
  // per-step second-order fits: build skips them (the models file records `options.fitSecondOrder: false`).
  const models =
    input.models ??
    identifyFromLogs({
      vehicle: vehicleFile,
      logPaths: input.logPaths,
      options: BUILD_IDENTIFY_OPTIONS,
      ...(input.progress === undefined ? {} : { progress: input.progress }),
      ...(input.readOptions === undefined ? {} : { readOptions: input.readOptions }),
    });
  const { vehicle: _path, logPaths: _logs, models: _models, plan: _plan, readOptions: _read, ...rest } = input;
  return buildScheduleFromData({ ...rest, vehicle, vehicleFile, vehicleSha256, models, plan, ...(planSha256 === undefined ? {} : { planSha256 }) });
}

/**
 * Build a checked schedule from loaded data (no file is read): gains at each breakpoint by the plan's rule,
 * interpolated, checked densely, refined. Asynchronous only because a plan's expressions of speed are compiled
 * with mathjs, loaded then.
 */
export async function buildScheduleFromData(input: LoadedBuildInput): Promise<BuildResult> {
  const progress = input.progress ?? (() => {});
  const { vehicle, vehicleFile, vehicleSha256, models } = input;
  if (models.vehicle.sha256 !== vehicleSha256 && input.allowOtherVehicle !== true) {
    throw new SpeedbandError(
      'build.otherVehicle',
      `the models were identified with another vehicle file (${quoted(models.vehicle.name)}, ${quoted(basename(models.vehicle.file))}, SHA-256 ${models.vehicle.sha256.slice(0, 12)}…) ` +
        `than the one given (${quoted(vehicle.name)}, SHA-256 ${vehicleSha256.slice(0, 12)}…): their stiffnesses were fitted with that file's mass, inertia and geometry — ` +
        'give the vehicle file they were identified with, identify again from the logs, or pass --allow-other-vehicle if the change is deliberate',
      { location: { file: vehicleFile }, details: { modelsVehicle: models.vehicle, vehicleSha256 } },
    );
  }
  const written = input.plan;
  const ruleParametersAt = await makeRuleParameterLookup(written.rule?.parameters ?? {}, input.planFile);
  const testSpeeds_mps = models.speeds.map((speed) => speed.speed_mps);
  const context = {
    testSpeeds_mps,
    ...(vehicle.controllerSampleTime_s === undefined ? {} : { vehicleSampleTime_s: vehicle.controllerSampleTime_s }),
    ...(vehicle.serviceAcceleration_mps2 === undefined ? {} : { vehicleServiceAcceleration_mps2: vehicle.serviceAcceleration_mps2 }),
    ...(vehicle.serviceDeceleration_mps2 === undefined ? {} : { vehicleServiceDeceleration_mps2: vehicle.serviceDeceleration_mps2 }),
  };
  const resolved = resolvePlan(written, { ...context, ...(input.planFile === undefined ? {} : { file: input.planFile }) });
  const checkModel = checkModelFromModels(models, vehicle, resolved.check.model);
  // A refused joint fit falls back to lumped models: the plan recorded in the schedule says which was used.
  const plan: Plan = checkModel.kind === resolved.check.model ? resolved : { ...resolved, check: { ...resolved.check, model: checkModel.kind } };
  const { loop, controller } = planLoopAndController(plan);

  const searching = plan.rule.tuneFor === 'fastest-passing';
  if (searching) {
    const free = freeParameterOf(plan.rule.name);
    for (const name of [free.name, ...free.alsoSetBy]) {
      if (plan.rule.parameters[name as keyof typeof plan.rule.parameters] !== undefined) {
        throw new SpeedbandError(
          'plan.invalid',
          `rule.parameters.${name} is given, but "tuneFor": "fastest-passing" searches ${free.name} at every breakpoint — remove one of them`,
          {
            location: { file: input.planFile, jsonPath: `/rule/parameters/${name}` },
          },
        );
      }
    }
  }
  const analyse = makeLoopAnalysis(checkModel, loop, controller);
  // The limits as every check reads them: numbers and tables, expressions of speed made tables at the check speeds.
  const limits = await acceptanceLimits(plan, input.planFile);
  const thresholds = limits.thresholds;
  const evaluatorInput = {
    model: checkModel,
    loop,
    controller,
    thresholds,
    limits: limits.timeDomain,
    vehicleLimits: { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps },
    antiWindup: plan.controller.antiWindup,
    analyse,
  };
  const evaluate = makeBreakpointEvaluator(evaluatorInput);
  const roomy = limitsWithRoom(thresholds, limits.timeDomain);
  const scenarioLimits = limits.scenarios;
  const scenarios = plan.check.scenarios && checkModel.kind === 'single-track';
  // The scenario stage's helper thread starts now, so that loading it overlaps the tuning and the dense check.
  const helper = scenarios ? startScenarioHelper() : null;
  try {
    // The search judges each candidate by the scenarios at its breakpoint too; the schedule's own scenario check follows below.
    const evaluateWithRoom = makeBreakpointEvaluator({
      ...evaluatorInput,
      ...roomy,
      skipFiguresWhenMarginsFail: true,
      ...(scenarios
        ? {
            scenarios: {
              limits: scenarioLimits,
              range: { minimum_mps: plan.speeds.minimum_mps, maximum_mps: plan.speeds.maximum_mps },
              names: SEARCH_SCENARIOS,
            },
          }
        : {}),
    });
    // The plan's variations as a set of vehicles around the check model: the robust check's, and a worst-case search's.
    const robustContext = planRobustContext({ plan, checkModel, loop, controller, models, planFile: input.planFile });
    const timeDomainSettings: TimeDomainSettings = {
      limits: limits.timeDomain,
      vehicleLimits: evaluatorInput.vehicleLimits,
      antiWindup: plan.controller.antiWindup,
    };
    const searchOnWorstCase = searching && plan.rule.searchOn === 'worst-case' && robustContext !== undefined;
    const searchEvaluate = searchOnWorstCase
      ? makeWorstCaseEvaluator({ nominal: evaluateWithRoom, context: robustContext, thresholds, timeDomain: timeDomainSettings })
      : evaluateWithRoom;
    type Tuned = { readonly tuned: TunedOperatingPoint; readonly evaluation: BreakpointEvaluation | null; readonly search: ScheduleSearchAt | null };
    const tuneCache = new Map<number, Tuned>();
    const tuneWith = (speed_mps: number, ruleParameters: RuleParameters, startGains?: PidGains): TunedOperatingPoint =>
      tuneOperatingPoint({
        loop,
        speed_mps,
        model: checkModel.modelAt(speed_mps),
        rule: plan.rule.name,
        ruleParameters,
        controller,
        ...(startGains === undefined ? {} : { startGains }),
      });
    const tune = (speed_mps: number): Tuned => {
      let entry = tuneCache.get(speed_mps);
      if (entry === undefined) {
        requireBoundedDelay(modelDelay_s(checkModel.modelAt(speed_mps)), controller, speed_mps);
        try {
          if (searching) {
            const found = fastestPassing({
              rule: plan.rule.name,
              speed_mps,
              parameters: ruleParametersAt(speed_mps),
              tune: (parameters, startGains) => tuneWith(speed_mps, parameters, startGains),
              evaluate: (gains) => searchEvaluate(speed_mps, gains),
              sensitivityLimits: {
                sensitivity: readAtSpeed(roomy.thresholds, speed_mps).maximumSensitivityPeak,
                complementary: readAtSpeed(roomy.thresholds, speed_mps).maximumComplementarySensitivityPeak,
              },
              phaseMarginLimit_deg: readAtSpeed(roomy.thresholds, speed_mps).minimumPhaseMargin_deg,
            });
            entry = { tuned: found.tuned, evaluation: found.evaluation, search: found.record };
          } else {
            entry = { tuned: tuneWith(speed_mps, ruleParametersAt(speed_mps)), evaluation: null, search: null };
          }
        } catch (error) {
          throw atSpeed(error, speed_mps);
        }
        tuneCache.set(speed_mps, entry);
      }
      return entry;
    };
    const tuneAt = (speed_mps: number): PidGains => tune(speed_mps).tuned.gains;
    const onProgress: ProgressCallback = (event) => {
      if (event.done === event.total || event.done % 50 === 0) {
        progress(`${event.stage}: ${event.done}/${event.total} speeds${event.note === undefined ? '' : ` — ${event.note}`}\n`);
      }
    };
    progress(
      `tune and check: ${plan.rule.name}${searching ? ` (fastest passing${searchOnWorstCase ? ' in the worst case over the variations' : ''})` : ''} for the ${plan.loop.kind} loop on the ${checkModel.kind} model\n`,
    );
    const refinement = scheduleGains({ plan, tuneAt, analyse, thresholds, onProgress });
    const entries = refinement.table.speeds_mps.map((speed) => tune(speed));
    const tuned = entries.map((entry) => entry.tuned);
    // Under robust acceptance the set-point weights are lowered until the worst overshoot over the variations keeps the limit.
    const robustWeights = robustContext !== undefined && plan.variations?.acceptance === 'robust';
    const evaluations = refinement.table.speeds_mps.map((speed, k) => {
      const evaluation = evaluate(speed, refinement.table.gains[k]);
      return robustWeights
        ? withRobustWeights({ evaluation, speed_mps: speed, gains: refinement.table.gains[k], evaluate, context: robustContext, settings: timeDomainSettings })
        : evaluation;
    });
    const breakpointExtras: BreakpointExtras[] = evaluations.map((evaluation) => ({
      setpointWeightProportional: evaluation.performance?.setpointWeights.proportional ?? 1,
      setpointWeightDerivative: evaluation.performance?.setpointWeights.derivative ?? 0,
      feedForward: evaluation.performanceLoop.feedForward.gain,
      feedForwardLeadTime_s: evaluation.performanceLoop.feedForward.leadTime_s,
      timeDomain: evaluation.performance?.figures ?? null,
      timeDomainFailures: evaluation.performance === null ? ['closed loop not stable: no time-domain figures'] : evaluation.performance.failures,
    }));
    const searchAtBreakpoints = searching ? entries.map((entry) => entry.search as ScheduleSearchAt) : undefined;
    const robust =
      plan.variations === undefined || robustContext === undefined
        ? undefined
        : await checkTableOverVariations({
            plan,
            variations: plan.variations,
            context: robustContext,
            refinement,
            breakpointExtras,
            timeDomain: timeDomainSettings,
            thresholds,
            onProgress,
            progress,
          });

    const inputs = [
      { file: vehicleFile, sha256: vehicleSha256, role: 'vehicle' },
      // Logs in the canonical order of identification (by content hash), whatever order a models file lists them in.
      ...[...models.inputs]
        .sort((a, b) => (a.sha256 < b.sha256 ? -1 : a.sha256 > b.sha256 ? 1 : a.file < b.file ? -1 : a.file > b.file ? 1 : 0))
        .map((entry) => ({ file: entry.file, sha256: entry.sha256, role: 'log' })),
      ...(input.planFile === undefined || input.planSha256 === undefined ? [] : [{ file: input.planFile, sha256: input.planSha256, role: 'plan' }]),
    ];
    const assembled = {
      vehicle: { name: vehicle.name, file: vehicleFile, sha256: inputs[0].sha256 },
      plan,
      limits,
      table: refinement.table,
      insertedByRefinement: refinement.insertedByRefinement,
      check: refinement.check,
      insertions: refinement.insertions,
      integratorClamp_rad: vehicle.maxSteerAngle_rad,
      maxSteerRate_radps: vehicle.maxSteerRate_radps,
      inputs,
      modelSummary: checkModel.summary as unknown as Readonly<Record<string, unknown>>,
      modelDescription: checkModel.description,
      ruleCitation: tuned[0]?.derivation.citation,
      // The rule's parameters as resolved at each breakpoint (tables and expressions evaluated, the searched one included).
      ...(Object.keys(plan.rule.parameters).length === 0 && searchAtBreakpoints === undefined
        ? {}
        : {
            ruleParametersAtBreakpoints: refinement.table.speeds_mps.map((speed_mps, k) => ({
              speed_mps,
              parameters: {
                ...ruleParametersAt(speed_mps),
                ...(searchAtBreakpoints === undefined ? {} : { [searchAtBreakpoints[k].parameter]: searchAtBreakpoints[k].value }),
              },
            })),
          }),
      breakpointExtras,
      ...(searchAtBreakpoints === undefined ? {} : { searchAtBreakpoints }),
      ...(robust === undefined ? {} : { variations: robust.record }),
    };
    let schedule = assembleSchedule(assembled);
    if (scenarios) {
      progress('scenarios: at each breakpoint, at low, middle and top speed, and through the range; the speed-change certificate\n');
      const { parameters, description } = scenarioParameters(checkModel, vehicle);
      const steeringLimits = { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps };
      const sizes = planSpeedChanges(plan);
      const { scenarioCheck, speedChange } = await scenarioStage(
        { schedule, parameters, steeringLimits, limits: scenarioLimits, model: description, sizes },
        helper,
      );
      schedule = assembleSchedule({ ...assembled, scenarioCheck, speedChange });
    }
    const extrapolations = refinement.table.speeds_mps.flatMap((speed_mps) => extrapolationAt(speed_mps, testSpeeds_mps, tuneAt) ?? []);
    return { schedule, models, plan, checkModel, refinement, tuned, evaluations, extrapolations, ...(robust === undefined ? {} : { robust }) };
  } finally {
    helper?.close();
  }
}
