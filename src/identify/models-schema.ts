/**
 * The models file (models.json) written by `speedband identify` and read by later
 * stages: its TypeScript type and its JSON Schema (validated on write and on read).
 * Field names other tools rely on: tests[].file, .speed_mps, .fopdt.{gain,
 * timeConstant_s, deadTime_s, ci95, rmse, r2}; speeds[].speed_mps, .fopdt;
 * singleTrack.{frontCorneringStiffness_NPerRad, rearCorneringStiffness_NPerRad,
 * actuatorLag_s, actuatorDelay_s, understeerGradient_radPerMps2} or null with
 * singleTrackRefusal. Units in names, SI, ISO 8855 signs (gain = yaw rate per
 * steer command, positive left → positive yaw).
 */

export const MODELS_FORMAT = 'speedband-models';
export const MODELS_FORMAT_VERSION = 1;

export type Interval = readonly [number, number];

/** An input file and the SHA-256 of its bytes. */
export interface HashedFile {
  readonly file: string;
  readonly sha256: string;
}

export interface FopdtRecord {
  /** Yaw rate per steer command, (rad/s)/rad = 1/s. */
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
  readonly standardErrors: { readonly gain: number; readonly timeConstant_s: number; readonly deadTime_s: number };
  readonly ci95: { readonly gain: Interval; readonly timeConstant_s: Interval; readonly deadTime_s: Interval };
}

export interface StepFopdtRecord extends FopdtRecord {
  /** Yaw-rate offset (sensor bias plus any steady pre-step yaw), rad/s. */
  readonly bias_radps: number;
  readonly rmse: number;
  readonly nrmse: number;
  readonly r2: number;
  readonly bic: number;
  readonly stopReason: 'converged' | 'iterationCap' | 'nonFinite';
  readonly iterations: number;
  readonly residualLag1Autocorrelation: number;
  readonly ljungBoxQ: number;
  readonly residualsWhite: boolean;
  /** Smith's two-point estimate (independent check), or null when the response allowed none. */
  readonly twoPoint: {
    readonly gain: number;
    readonly timeConstant_s: number;
    readonly deadTime_s: number;
    /** Within `TWO_POINT_AGREEMENT` of the fit (two-point-agreement.ts); absent in files written before it was recorded. */
    readonly agreesWithFit?: boolean;
  } | null;
}

export interface SecondOrderRecord {
  readonly gain: number;
  readonly naturalFrequency_radps: number;
  readonly dampingRatio: number;
  readonly zeroTimeConstant_s: number;
  readonly deadTime_s: number;
  readonly r2: number;
  readonly bic: number;
  readonly stopReason: 'converged' | 'iterationCap' | 'nonFinite';
}

export type ModelStructureName = 'fopdt' | 'second-order' | 'second-order-zero';

export interface TestRecord {
  readonly file: string;
  readonly stepIndex: number;
  readonly onset_s: number;
  readonly speed_mps: number;
  readonly amplitude_rad: number;
  readonly direction: 'left' | 'right';
  readonly yawNoise_radps: number;
  readonly fopdt: StepFopdtRecord;
  /** Null when second-order fits were switched off or gave non-finite values. */
  readonly secondOrder: SecondOrderRecord | null;
  /** Null also when not needed: fitted only when the model without zero leaves non-white residuals. */
  readonly secondOrderZero: SecondOrderRecord | null;
  /** Structure with the lowest BIC. */
  readonly chosenModel: ModelStructureName;
}

/** A step the quality gate refused: where, why, and the FOPDT values found (null where not finite). */
export interface RefusedTestRecord {
  readonly file: string;
  readonly stepIndex: number;
  readonly onset_s: number;
  readonly speed_mps: number;
  readonly amplitude_rad: number;
  readonly direction: 'left' | 'right';
  readonly reasonCode: string;
  readonly reason: string;
  readonly fopdt: { readonly gain: number | null; readonly timeConstant_s: number | null; readonly deadTime_s: number | null; readonly r2: number | null };
}

/** The model at one nominal test speed: inverse-variance FOPDT over its steps, asymmetry and spread. */
export interface SpeedRecord {
  readonly speed_mps: number;
  readonly stepCount: number;
  /** The steps combined here (keys into tests[]). */
  readonly steps: readonly { readonly file: string; readonly stepIndex: number }[];
  /** Inverse-variance weighted over the steps at this speed. */
  readonly fopdt: FopdtRecord;
  readonly asymmetry_pct: number | null;
  readonly repeatSpread_pct: number;
}

export interface ActuatorRecord {
  readonly gain: number;
  readonly lag_s: number;
  readonly delay_s: number;
  readonly ci95: { readonly gain: Interval; readonly lag_s: Interval; readonly delay_s: Interval };
  readonly stepCount: number;
}

/** The joint single-track fit over all steps: cornering stiffnesses, actuator lag and delay, understeer gradient, 95 % intervals, fit quality. */
export interface SingleTrackRecord {
  readonly frontCorneringStiffness_NPerRad: number;
  readonly rearCorneringStiffness_NPerRad: number;
  readonly actuatorLag_s: number;
  readonly actuatorDelay_s: number;
  readonly understeerGradient_radPerMps2: number;
  readonly ci95: {
    readonly frontCorneringStiffness_NPerRad: Interval;
    readonly rearCorneringStiffness_NPerRad: Interval;
    readonly actuatorLag_s: Interval;
    readonly actuatorDelay_s: Interval;
    readonly understeerGradient_radPerMps2: Interval;
  };
  /** √(L/K) for understeer, else null, m/s. */
  readonly characteristicSpeed_mps: number | null;
  /** √(−L/K) for oversteer, else null, m/s. */
  readonly criticalSpeed_mps: number | null;
  readonly r2: number;
  readonly rmse: number;
  readonly stepCount: number;
  readonly stopReason: 'converged' | 'iterationCap' | 'nonFinite';
  /** Per speed: the joint model's steady yaw gain against the per-speed FOPDT gain. */
  readonly comparison: readonly {
    readonly speed_mps: number;
    readonly fopdtGain: number;
    readonly singleTrackGain: number;
    readonly difference_pct: number;
    readonly singleTrackRmse_radps: number;
    readonly fopdtRmse_radps: number;
  }[];
}

/** models.json: per-step and per-speed FOPDT models with 95 % intervals, the actuator, the joint single-track fit, the inputs with their SHA-256. */
export interface ModelsFile {
  readonly format: typeof MODELS_FORMAT;
  readonly formatVersion: typeof MODELS_FORMAT_VERSION;
  readonly tool: { readonly name: 'speedband'; readonly version: string };
  readonly vehicle: { readonly name: string } & HashedFile;
  readonly inputs: readonly HashedFile[];
  readonly options: Readonly<Record<string, string | number | boolean>>;
  /** Model choice per step: Bayesian information criterion. */
  readonly criterion: 'BIC';
  readonly tests: readonly TestRecord[];
  readonly refusedTests: readonly RefusedTestRecord[];
  /** Candidates the segmentation rejected, with reasons. */
  readonly rejectedSteps: readonly { readonly file: string; readonly onset_s: number; readonly reasonCode: string; readonly reason: string }[];
  readonly speeds: readonly SpeedRecord[];
  readonly actuator: ActuatorRecord | null;
  readonly singleTrack: SingleTrackRecord | null;
  readonly singleTrackRefusal: { readonly reasonCode: string; readonly reason: string } | null;
  readonly warnings: readonly string[];
}

const number = { type: 'number' } as const;
const interval = { type: 'array', items: number, minItems: 2, maxItems: 2 } as const;
const nullableNumber = { type: ['number', 'null'] } as const;
const stopReason = { enum: ['converged', 'iterationCap', 'nonFinite'] } as const;
const hashedFile = {
  type: 'object',
  additionalProperties: false,
  required: ['file', 'sha256'],
  properties: { file: { type: 'string' }, sha256: { type: 'string', pattern: '^[0-9a-f]{64}$' } },
} as const;
const reason = {
  type: 'object',
  additionalProperties: false,
  required: ['reasonCode', 'reason'],
  properties: { reasonCode: { type: 'string' }, reason: { type: 'string' } },
} as const;
const fopdtProperties = {
  gain: number,
  timeConstant_s: number,
  deadTime_s: number,
  standardErrors: {
    type: 'object',
    additionalProperties: false,
    required: ['gain', 'timeConstant_s', 'deadTime_s'],
    properties: { gain: number, timeConstant_s: number, deadTime_s: number },
  },
  ci95: {
    type: 'object',
    additionalProperties: false,
    required: ['gain', 'timeConstant_s', 'deadTime_s'],
    properties: { gain: interval, timeConstant_s: interval, deadTime_s: interval },
  },
} as const;
const fopdtRecord = {
  type: 'object',
  additionalProperties: false,
  required: ['gain', 'timeConstant_s', 'deadTime_s', 'standardErrors', 'ci95'],
  properties: fopdtProperties,
} as const;
const stepFopdtRecord = {
  type: 'object',
  additionalProperties: false,
  required: [
    'gain',
    'timeConstant_s',
    'deadTime_s',
    'standardErrors',
    'ci95',
    'bias_radps',
    'rmse',
    'nrmse',
    'r2',
    'bic',
    'stopReason',
    'iterations',
    'residualLag1Autocorrelation',
    'ljungBoxQ',
    'residualsWhite',
    'twoPoint',
  ],
  properties: {
    ...fopdtProperties,
    bias_radps: number,
    rmse: number,
    nrmse: number,
    r2: number,
    bic: number,
    stopReason,
    iterations: { type: 'integer', minimum: 0 },
    residualLag1Autocorrelation: number,
    ljungBoxQ: number,
    residualsWhite: { type: 'boolean' },
    twoPoint: {
      anyOf: [
        { type: 'null' },
        {
          type: 'object',
          additionalProperties: false,
          required: ['gain', 'timeConstant_s', 'deadTime_s'],
          properties: { gain: number, timeConstant_s: number, deadTime_s: number, agreesWithFit: { type: 'boolean' } },
        },
      ],
    },
  },
} as const;
const secondOrderRecord = {
  anyOf: [
    { type: 'null' },
    {
      type: 'object',
      additionalProperties: false,
      required: ['gain', 'naturalFrequency_radps', 'dampingRatio', 'zeroTimeConstant_s', 'deadTime_s', 'r2', 'bic', 'stopReason'],
      properties: {
        gain: number,
        naturalFrequency_radps: number,
        dampingRatio: number,
        zeroTimeConstant_s: number,
        deadTime_s: number,
        r2: number,
        bic: number,
        stopReason,
      },
    },
  ],
} as const;
const testRecord = {
  type: 'object',
  additionalProperties: false,
  required: [
    'file',
    'stepIndex',
    'onset_s',
    'speed_mps',
    'amplitude_rad',
    'direction',
    'yawNoise_radps',
    'fopdt',
    'secondOrder',
    'secondOrderZero',
    'chosenModel',
  ],
  properties: {
    file: { type: 'string' },
    stepIndex: { type: 'integer', minimum: 0 },
    onset_s: number,
    speed_mps: number,
    amplitude_rad: number,
    direction: { enum: ['left', 'right'] },
    yawNoise_radps: number,
    fopdt: { $ref: '#/definitions/stepFopdtRecord' },
    secondOrder: { $ref: '#/definitions/secondOrderRecord' },
    secondOrderZero: { $ref: '#/definitions/secondOrderRecord' },
    chosenModel: { enum: ['fopdt', 'second-order', 'second-order-zero'] },
  },
} as const;
const refusedTestRecord = {
  type: 'object',
  additionalProperties: false,
  required: ['file', 'stepIndex', 'onset_s', 'speed_mps', 'amplitude_rad', 'direction', 'reasonCode', 'reason', 'fopdt'],
  properties: {
    file: { type: 'string' },
    stepIndex: { type: 'integer', minimum: 0 },
    onset_s: number,
    speed_mps: number,
    amplitude_rad: number,
    direction: { enum: ['left', 'right'] },
    reasonCode: { type: 'string' },
    reason: { type: 'string' },
    fopdt: {
      type: 'object',
      additionalProperties: false,
      required: ['gain', 'timeConstant_s', 'deadTime_s', 'r2'],
      properties: { gain: nullableNumber, timeConstant_s: nullableNumber, deadTime_s: nullableNumber, r2: nullableNumber },
    },
  },
} as const;

export const MODELS_SCHEMA = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  title: 'speedband models file',
  // Shared parts as definitions: Ajv compiles each once (faster start-up than inlined copies).
  definitions: { hashedFile, reason, fopdtRecord, stepFopdtRecord, secondOrderRecord, testRecord, refusedTestRecord },
  type: 'object',
  additionalProperties: false,
  required: [
    'format',
    'formatVersion',
    'tool',
    'vehicle',
    'inputs',
    'options',
    'criterion',
    'tests',
    'refusedTests',
    'rejectedSteps',
    'speeds',
    'actuator',
    'singleTrack',
    'singleTrackRefusal',
    'warnings',
  ],
  properties: {
    format: { const: MODELS_FORMAT },
    formatVersion: { const: MODELS_FORMAT_VERSION },
    tool: {
      type: 'object',
      additionalProperties: false,
      required: ['name', 'version'],
      properties: { name: { const: 'speedband' }, version: { type: 'string' } },
    },
    vehicle: {
      type: 'object',
      additionalProperties: false,
      required: ['name', 'file', 'sha256'],
      properties: { name: { type: 'string' }, file: { type: 'string' }, sha256: { type: 'string', pattern: '^[0-9a-f]{64}$' } },
    },
    inputs: { type: 'array', items: { $ref: '#/definitions/hashedFile' } },
    options: { type: 'object', additionalProperties: { type: ['string', 'number', 'boolean'] } },
    criterion: { const: 'BIC' },
    tests: { type: 'array', items: { $ref: '#/definitions/testRecord' } },
    refusedTests: { type: 'array', items: { $ref: '#/definitions/refusedTestRecord' } },
    rejectedSteps: {
      type: 'array',
      items: {
        type: 'object',
        additionalProperties: false,
        required: ['file', 'onset_s', 'reasonCode', 'reason'],
        properties: { file: { type: 'string' }, onset_s: number, reasonCode: { type: 'string' }, reason: { type: 'string' } },
      },
    },
    speeds: {
      type: 'array',
      items: {
        type: 'object',
        additionalProperties: false,
        required: ['speed_mps', 'stepCount', 'steps', 'fopdt', 'asymmetry_pct', 'repeatSpread_pct'],
        properties: {
          speed_mps: number,
          stepCount: { type: 'integer', minimum: 1 },
          steps: {
            type: 'array',
            items: {
              type: 'object',
              additionalProperties: false,
              required: ['file', 'stepIndex'],
              properties: { file: { type: 'string' }, stepIndex: { type: 'integer', minimum: 0 } },
            },
          },
          fopdt: { $ref: '#/definitions/fopdtRecord' },
          asymmetry_pct: nullableNumber,
          repeatSpread_pct: number,
        },
      },
    },
    actuator: {
      anyOf: [
        { type: 'null' },
        {
          type: 'object',
          additionalProperties: false,
          required: ['gain', 'lag_s', 'delay_s', 'ci95', 'stepCount'],
          properties: {
            gain: number,
            lag_s: number,
            delay_s: number,
            ci95: {
              type: 'object',
              additionalProperties: false,
              required: ['gain', 'lag_s', 'delay_s'],
              properties: { gain: interval, lag_s: interval, delay_s: interval },
            },
            stepCount: { type: 'integer', minimum: 1 },
          },
        },
      ],
    },
    singleTrack: {
      anyOf: [
        { type: 'null' },
        {
          type: 'object',
          additionalProperties: false,
          required: [
            'frontCorneringStiffness_NPerRad',
            'rearCorneringStiffness_NPerRad',
            'actuatorLag_s',
            'actuatorDelay_s',
            'understeerGradient_radPerMps2',
            'ci95',
            'characteristicSpeed_mps',
            'criticalSpeed_mps',
            'r2',
            'rmse',
            'stepCount',
            'stopReason',
            'comparison',
          ],
          properties: {
            frontCorneringStiffness_NPerRad: number,
            rearCorneringStiffness_NPerRad: number,
            actuatorLag_s: number,
            actuatorDelay_s: number,
            understeerGradient_radPerMps2: number,
            ci95: {
              type: 'object',
              additionalProperties: false,
              required: [
                'frontCorneringStiffness_NPerRad',
                'rearCorneringStiffness_NPerRad',
                'actuatorLag_s',
                'actuatorDelay_s',
                'understeerGradient_radPerMps2',
              ],
              properties: {
                frontCorneringStiffness_NPerRad: interval,
                rearCorneringStiffness_NPerRad: interval,
                actuatorLag_s: interval,
                actuatorDelay_s: interval,
                understeerGradient_radPerMps2: interval,
              },
            },
            characteristicSpeed_mps: nullableNumber,
            criticalSpeed_mps: nullableNumber,
            r2: number,
            rmse: number,
            stepCount: { type: 'integer', minimum: 1 },
            stopReason,
            comparison: {
              type: 'array',
              items: {
                type: 'object',
                additionalProperties: false,
                required: ['speed_mps', 'fopdtGain', 'singleTrackGain', 'difference_pct', 'singleTrackRmse_radps', 'fopdtRmse_radps'],
                properties: {
                  speed_mps: number,
                  fopdtGain: number,
                  singleTrackGain: number,
                  difference_pct: number,
                  singleTrackRmse_radps: number,
                  fopdtRmse_radps: number,
                },
              },
            },
          },
        },
      ],
    },
    singleTrackRefusal: { anyOf: [{ type: 'null' }, { $ref: '#/definitions/reason' }] },
    warnings: { type: 'array', items: { type: 'string' } },
  },
} as const;
