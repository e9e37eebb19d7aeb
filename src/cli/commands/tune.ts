import { SpeedbandError } from '../../core/errors.js';
import { CONTROLLER_DEFAULTS, describeControllerSettings, resolveControllerSettings } from '../../controller/defaults.js';
import type { ControllerSettings } from '../../controller/types.js';
import { TUNING_DEFAULTS } from '../../tuning/defaults.js';
import { RULE_NAMES, findRule, parameterNotTakenWords, parametersNotTaken } from '../../tuning/registry.js';
import type { RuleParameterName, RuleParameters } from '../../tuning/types.js';
import type { Vehicle } from '../../vehicle/types.js';
import type { OperatingPointModel } from '../../tuning/operating-point.js';
import type { LoopSpecification } from '../../loops/types.js';
import { DEFAULT_PATH_PREVIEW, PLAN_DEFAULTS } from '../../schedule/plan.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { numberOption } from '../number-option.js';
import { EXIT } from '../io.js';
import { QUOTED_TEXT_MAX, cutText, quoted } from '../../core/quote.js';

function builder(yargs: Argv) {
  return yargs
    .usage(
      'speedband tune --rule RULE --speed-mps V (--models models.json --vehicle V | --gain K --time-constant-s T --dead-time-s L | --vehicle V) [options]\n\n' +
        'The model is one of: the models identified from step tests (--models, from `speedband identify`, with the vehicle file it was identified with: the joint single-track fit, ' +
        'else the per-speed FOPDT models interpolated between the test speeds — the model `speedband build` tunes on); a lumped steer-command → yaw-rate FOPDT K·e^(−Ls)/(Ts + 1) given by hand; ' +
        'or a vehicle file alone with nominal cornering stiffnesses (single-track model with its actuator; nominal values are for the simulator — to tune a real vehicle, identify it and use --models). ' +
        'The rule is applied to the design model of the chosen loop (yaw rate: self-regulating; heading: integrating; path: double-integrating); the margins are computed on the full loop with the exact delay, ' +
        'the derivative filter and the controller delay Ts/2 + latency, and again with the discrete PID the firmware runs (the exact sampled loop, as build and check judge it). ' +
        "The controller settings default as in build: the vehicle file's sample time (else 0.01 s), one sample of latency, backward Euler, N = 10.",
    )
    .option('rule', { type: 'string', choices: RULE_NAMES, demandOption: true, describe: 'Tuning rule' })
    .option('loop', {
      type: 'string',
      choices: ['yaw-rate', 'heading', 'path'] as const,
      default: PLAN_DEFAULTS.loop.kind,
      describe: 'The loop the firmware closes',
    })
    .option('speed-mps', { type: 'number', demandOption: true, describe: 'Forward speed of the operating point, m/s' })
    .option('preview-m', {
      type: 'number',
      describe: `Path loop: preview distance ahead of the reference point, m (default, as build: ${DEFAULT_PATH_PREVIEW.preview_m} m when neither --preview-m nor --preview-time-s is given, else 0)`,
    })
    .option('preview-time-s', {
      type: 'number',
      describe: `Path loop: preview time, s — the preview is preview-m + preview-time-s × speed (default, as build: ${DEFAULT_PATH_PREVIEW.previewTime_s} s when neither is given, else 0)`,
    })
    .option('reference-point', {
      type: 'string',
      choices: ['cg', 'front-axle'] as const,
      describe: `Path loop: where the preview distance is measured from (default, as build: ${PLAN_DEFAULTS.loop.referencePoint} when --vehicle gives the axle positions, else cg)`,
    })
    .option('gain', { type: 'number', describe: 'FOPDT steady yaw-rate gain K, (rad/s)/rad' })
    .option('time-constant-s', { type: 'number', describe: 'FOPDT time constant T, s' })
    .option('dead-time-s', { type: 'number', describe: 'FOPDT dead time L, s (actuator delay included, as identified)' })
    .option('models', {
      type: 'string',
      describe: 'models.json from `speedband identify`: tune on the identified model at --speed-mps (needs --vehicle for mass, inertia and geometry)',
    })
    .option('vehicle', {
      type: 'string',
      describe:
        "Vehicle file (vehicle.json) or its folder. With --models: mass, yaw inertia, axle distances and sample time for the identified model. Alone: the single-track model with the file's nominal cornering stiffnesses — values for the simulator, not measured; to tune a real vehicle use --models. With --gain: only the geometry (front-axle preview) and sample time",
    })
    .option('controller-type', {
      type: 'string',
      choices: ['P', 'PI', 'PID'] as const,
      describe: `Controller terms (Ziegler–Nichols default ${TUNING_DEFAULTS.controllerType}; SIMC default by plant class)`,
    })
    .option('closed-loop-time-constant-s', { type: 'number', describe: "IMC λ or SIMC τc, s (default: the design model's dead time θ)" })
    .option('damping-ratio', { type: 'number', describe: `Damping target ζ (default ${TUNING_DEFAULTS.dampingRatio})` })
    .option('natural-frequency-radps', {
      type: 'number',
      describe: `Damping target ωn, rad/s (default: from --settling-distance-m, else ωn·θ_eff = ${TUNING_DEFAULTS.defaultBandwidthDelayProduct})`,
    })
    .option('settling-distance-m', { type: 'number', describe: 'Damping target settling distance D, m: ωn = 4·v/(ζ·D)' })
    .option('integral-pole-ratio', { type: 'number', describe: `Damping target ωn/p (default ${TUNING_DEFAULTS.integralPoleRatio})` })
    .option('sensitivity-peak-target', {
      type: 'number',
      describe: `MIGO: the bound M on both sensitivity peaks, Ms ≤ M and Mt ≤ M (default ${TUNING_DEFAULTS.sensitivityPeakTarget})`,
    })
    .option('phase-margin-target-deg', { type: 'number', describe: 'MIGO: also keep the phase margin at least this, degrees (no default)' })
    .option('sample-time-s', {
      type: 'number',
      describe: `Controller sample time Ts, s (default, as build: the vehicle file's controllerSampleTime_s, else ${CONTROLLER_DEFAULTS.sampleTime_s})`,
    })
    .option('latency-s', { type: 'number', describe: 'Computation latency from sample to steer command, s (default, as build: one sample, Ts)' })
    .option('derivative-filter', {
      type: 'number',
      describe: `Derivative filter factor N: Tf = (kd/kp)/N (default ${CONTROLLER_DEFAULTS.derivativeFilter}, as build)`,
    })
    .option('discretisation', {
      type: 'string',
      choices: ['backward-euler', 'tustin'] as const,
      describe: `Discretisation of the firmware's PID, for the margins of the sampled loop (default ${CONTROLLER_DEFAULTS.discretisation}, as build)`,
    })
    .option('json', { type: 'boolean', default: false, describe: 'Print the tuned point as JSON (SI units in field names)' });
}

type Args = OptionsOf<typeof builder>;

export const command = defineCommand({
  command: 'tune',
  describe:
    'Tune one operating point: apply a published tuning rule to the loop the firmware closes at one speed and report the gains, the derivation and the margins of the full loop',
  builder,
  exitCodes: [
    [0, 'the tuned loop is stable, as designed and with the discrete PID'],
    [1, 'it is not stable'],
    [2, 'bad input, an option the rule does not use, or a rule that does not apply to the loop (the rules that do are named)'],
  ],
  examples: [
    [
      'speedband tune --rule simc --loop heading --speed-mps 10 --models models.json --vehicle vehicles/parcel-van',
      'SIMC for a heading loop on the model identified by `speedband identify` (joint single-track fit)',
    ],
    [
      'speedband tune --rule simc --loop yaw-rate --speed-mps 8 --gain 2.4 --time-constant-s 0.12 --dead-time-s 0.07',
      'SIMC PI for a yaw-rate loop from an identified FOPDT',
    ],
    [
      'speedband tune --rule damping-target --loop path --preview-m 2 --reference-point front-axle --speed-mps 10 --settling-distance-m 100 --vehicle vehicles/parcel-van',
      'Path loop with 2 m preview from the front axle, settling within 100 m, on the single-track model',
    ],
    [
      'speedband tune --rule ziegler-nichols-ultimate --controller-type PI --loop heading --speed-mps 2 --vehicle vehicles/vineyard-sprayer --json',
      'Ziegler–Nichols PI for a heading loop, machine-readable',
    ],
    [
      'speedband tune --rule migo --loop path --preview-m 0.5 --preview-time-s 0.3 --reference-point front-axle --speed-mps 12 --sensitivity-peak-target 1.6 --vehicle vehicles/parcel-van',
      'MIGO: the largest integral gain with Ms and Mt ≤ 1.6 on the sampled path loop',
    ],
  ],
  run: async (args, io) => {
    const { tuneOperatingPoint } = await import('../../tuning/operating-point.js');
    const { describeTunedOperatingPoint } = await import('../../tuning/describe.js');
    ruleParametersFromOptions(args, args.rule); // an option the rule does not use is refused before any model is read
    const vehicle = args.vehicle === undefined ? undefined : (await import('../../vehicle/load.js')).loadVehicle(args.vehicle);
    const speed_mps = numberOption(args, 'speed-mps')!;
    const gain = numberOption(args, 'gain');
    const timeConstant_s = numberOption(args, 'time-constant-s');
    const deadTime_s = numberOption(args, 'dead-time-s');
    const fopdtGiven = [gain, timeConstant_s, deadTime_s].filter((value) => value !== undefined).length;
    if (fopdtGiven !== 0 && fopdtGiven !== 3) {
      throw new SpeedbandError('cli.incompleteModel', 'a FOPDT model needs all of --gain, --time-constant-s and --dead-time-s', {
        details: { gain, timeConstant_s, deadTime_s },
      });
    }
    if (fopdtGiven === 0 && vehicle === undefined && args.models === undefined) {
      throw new SpeedbandError(
        'cli.missingModel',
        'no model given — pass --models models.json with --vehicle (identified by `speedband identify`), --gain, --time-constant-s and --dead-time-s (an identified FOPDT), or --vehicle with nominal cornering stiffnesses',
      );
    }
    let model;
    let modelWords: { description: string; warnings: readonly string[]; testSpeeds_mps: readonly number[] } | undefined;
    let modelFromModels: ((at_mps: number) => OperatingPointModel) | undefined;
    if (args.models !== undefined) {
      const given = vehicle === undefined || args.vehicle === undefined ? undefined : { path: args.vehicle, vehicle };
      const fromModels = await modelFromModelsFile(args.models, given, fopdtGiven, speed_mps);
      model = fromModels.model;
      modelWords = fromModels;
      modelFromModels = (at_mps) => fromModels.modelAt(at_mps);
    } else if (fopdtGiven === 3) {
      if (timeConstant_s! < 0 || deadTime_s! < 0) {
        throw new SpeedbandError('cli.badNumber', `FOPDT times must be ≥ 0 s; got time constant ${timeConstant_s} s and dead time ${deadTime_s} s`);
      }
      model = {
        kind: 'lumped' as const,
        yawRate: { kind: 'fopdt' as const, gain: gain!, timeConstant_s: timeConstant_s!, deadTime_s: deadTime_s! },
        ...(vehicle === undefined ? {} : { cgToFrontAxle_m: vehicle.cgToFrontAxle_m }),
      };
    } else {
      const { singleTrackParametersFromVehicle } = await import('../../vehicle/single-track.js');
      model = { kind: 'single-track' as const, parameters: singleTrackParametersFromVehicle(vehicle!) };
    }
    // The same defaults as build and stability (src/controller/defaults.ts): the vehicle's sample time, one sample of latency.
    const controller: ControllerSettings = resolveControllerSettings(
      {
        ...optionalNumber('sampleTime_s', numberOption(args, 'sample-time-s')),
        ...optionalNumber('computationLatency_s', numberOption(args, 'latency-s')),
        ...optionalNumber('derivativeFilter', numberOption(args, 'derivative-filter')),
        ...(args.discretisation === undefined ? {} : { discretisation: args.discretisation }),
      },
      vehicle?.controllerSampleTime_s,
    );
    const ruleParameters = ruleParametersFromOptions(args, args.rule);
    const request = {
      loop: tuneLoop(args),
      speed_mps,
      model,
      rule: args.rule,
      ruleParameters,
      controller,
    };
    const point = tuneOperatingPoint(request);
    // Beyond the tested speeds: how far, and how large the gains are against those at the nearest test speed.
    const extrapolation =
      modelWords === undefined
        ? null
        : (await import('../../pipeline/extrapolation.js')).extrapolationAt(speed_mps, modelWords.testSpeeds_mps, (at) =>
            at === speed_mps ? point.gains : tuneOperatingPoint({ ...request, speed_mps: at, model: modelFromModels!(at) }).gains,
          );
    const warnings = [
      ...(modelWords?.warnings ?? []),
      ...(extrapolation === null ? [] : [(await import('../../pipeline/extrapolation.js')).extrapolationWords(extrapolation)]),
      ...point.warnings,
    ];
    // The margins of the discrete PID the firmware runs: the analysis of build's dense check.
    const sampledMargins = (await import('../../pipeline/loop-analysis.js')).analyseSampledLoop(point.loop, point.gains, controller);
    if (args.json) {
      const modelSource = modelWords === undefined ? {} : { model: { source: args.models, kind: model.kind, description: modelWords.description } };
      io.stdout(
        `${JSON.stringify({ ...modelSource, controller, gains: point.gains, derivation: point.derivation, design: point.design, loop: point.loop, margins: point.margins, sampledMargins, warnings }, null, 2)}\n`,
      );
    } else {
      const modelWarnings = warnings.slice(0, warnings.length - point.warnings.length);
      const header =
        modelWords === undefined ? [] : [`Model: ${modelWords.description} (${args.models})`, ...modelWarnings.map((warning) => `Warning: ${warning}`)];
      io.stdout(`${[...header, `Controller: ${describeControllerSettings(controller)}`, describeTunedOperatingPoint(point, sampledMargins)].join('\n')}\n`);
    }
    return point.margins.stable && sampledMargins.stable ? EXIT.ok : EXIT.failed;
  },
});

/** The identified model at the speed (`operatingPointModelFromModels`); --models excludes a hand-given FOPDT and needs --vehicle. */
async function modelFromModelsFile(modelsPath: string, given: { path: string; vehicle: Vehicle } | undefined, fopdtGiven: number, speed_mps: number) {
  if (fopdtGiven > 0) {
    throw new SpeedbandError('cli.conflictingOptions', '--models and --gain/--time-constant-s/--dead-time-s both give the vehicle model — use one');
  }
  const models = (await import('../../identify/models-file.js')).readModels(modelsPath);
  if (given === undefined) {
    throw new SpeedbandError(
      'cli.missingVehicle',
      `--models needs --vehicle: the models file records the vehicle's name and hash, not its mass, inertia and geometry — pass the vehicle file it was identified with (${quoted(models.vehicle.name)}, ${cutText(models.vehicle.file, QUOTED_TEXT_MAX)})`,
      { location: { file: modelsPath, jsonPath: '/vehicle' } },
    );
  }
  const { resolveVehiclePath } = await import('../../vehicle/load.js');
  const { sha256Hex } = await import('../../core/files.js');
  const { readFileSync } = await import('node:fs');
  const { operatingPointModelFromModels } = await import('../../pipeline/operating-point-from-models.js');
  const vehicleSha256 = sha256Hex(readFileSync(resolveVehiclePath(given.path)));
  return {
    ...operatingPointModelFromModels(models, given.vehicle, speed_mps, vehicleSha256),
    modelAt: (at_mps: number) => operatingPointModelFromModels(models, given.vehicle, at_mps).model,
  };
}

/** The command-line option of each rule parameter (λ and τc share one option: the rule says which it is). */
const PARAMETER_OPTIONS: Readonly<Record<RuleParameterName, string>> = {
  controllerType: '--controller-type',
  closedLoopTimeConstant_s: '--closed-loop-time-constant-s',
  simcClosedLoopTimeConstant_s: '--closed-loop-time-constant-s',
  dampingRatio: '--damping-ratio',
  naturalFrequency_radps: '--natural-frequency-radps',
  settlingDistance_m: '--settling-distance-m',
  integralPoleRatio: '--integral-pole-ratio',
  sensitivityPeakTarget: '--sensitivity-peak-target',
  phaseMarginTarget_deg: '--phase-margin-target-deg',
};

/**
 * The rule's parameters from the options given; an option the rule does not use is refused (it would be
 * ignored), naming the options the rule takes. --closed-loop-time-constant-s is IMC's λ or SIMC's τc.
 */
function ruleParametersFromOptions(args: Args, ruleName: string): RuleParameters {
  const rule = findRule(ruleName);
  const timeConstant = numberOption(args, 'closed-loop-time-constant-s');
  const timeConstantName: RuleParameterName = rule.parameters.includes('simcClosedLoopTimeConstant_s')
    ? 'simcClosedLoopTimeConstant_s'
    : 'closedLoopTimeConstant_s';
  const given: RuleParameters = {
    ...(args['controller-type'] === undefined ? {} : { controllerType: args['controller-type'] }),
    ...optionalNumber(timeConstantName, timeConstant),
    ...optionalNumber('dampingRatio', numberOption(args, 'damping-ratio')),
    ...optionalNumber('naturalFrequency_radps', numberOption(args, 'natural-frequency-radps')),
    ...optionalNumber('settlingDistance_m', numberOption(args, 'settling-distance-m')),
    ...optionalNumber('integralPoleRatio', numberOption(args, 'integral-pole-ratio')),
    ...optionalNumber('sensitivityPeakTarget', numberOption(args, 'sensitivity-peak-target')),
    ...optionalNumber('phaseMarginTarget_deg', numberOption(args, 'phase-margin-target-deg')),
  };
  const notTaken = parametersNotTaken(rule, Object.keys(given));
  if (notTaken.length > 0) {
    const shown = (parameter: RuleParameterName): string => PARAMETER_OPTIONS[parameter];
    throw new SpeedbandError('cli.optionNotTaken', `${parameterNotTakenWords(rule, notTaken[0], shown)} — drop it or choose another --rule`, {
      details: {
        rule: rule.name,
        options: notTaken.map((name) => PARAMETER_OPTIONS[name as RuleParameterName]),
        takes: [...new Set(rule.parameters.map(shown))],
      },
    });
  }
  return given;
}

function optionalNumber<K extends string>(key: K, value: number | undefined): Partial<Record<K, number>> {
  return value === undefined ? {} : ({ [key]: value } as Record<K, number>);
}

/** The loop of the tuned point, with build's defaults: a path loop given no preview gets the plan's default preview. */
function tuneLoop(args: Args): LoopSpecification {
  const previewGiven = args['preview-m'] !== undefined || args['preview-time-s'] !== undefined;
  const preview =
    args.loop === 'path' && !previewGiven
      ? DEFAULT_PATH_PREVIEW
      : { preview_m: numberOption(args, 'preview-m') ?? 0, previewTime_s: numberOption(args, 'preview-time-s') ?? 0 };
  return { kind: args.loop, ...preview, referencePoint: args['reference-point'] ?? (args.vehicle === undefined ? 'cg' : PLAN_DEFAULTS.loop.referencePoint) };
}
