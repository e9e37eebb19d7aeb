/**
 * JSON Schema of schedule.json (validated on write and on read). The order of `properties`
 * is also the order fields are written in (see schedule-json.ts).
 */
import { SCHEDULE_VARIATIONS_SCHEMA } from './schedule-variations-schema.js';

const number = { type: 'number' } as const;
const nullableNumber = { type: ['number', 'null'] } as const;
const text = { type: 'string' } as const;
const sha256 = { type: 'string', pattern: '^[0-9a-f]{64}$' } as const;
const freeObject = { type: 'object' } as const;

const worstValue = {
  type: ['object', 'null'],
  additionalProperties: false,
  required: ['value', 'speed_mps'],
  properties: { value: number, speed_mps: number },
} as const;

const object = (properties: Record<string, object>, optional: readonly string[] = []) => ({
  type: 'object',
  additionalProperties: false,
  required: Object.keys(properties).filter((key) => !optional.includes(key)),
  properties,
});

const nullableTime = { type: ['number', 'null'], minimum: 0 } as const;
const disturbance = object({ size: number, peakError: number, recoveryTime_s: nullableTime });
const timeDomainFigures = {
  ...object({
    referenceStep: object({ overshoot_pct: number, settlingTime_s: nullableTime, settlingDistance_m: nullableTime }),
    steeringMisalignment: disturbance,
    lateralForce: { ...disturbance, type: ['object', 'null'] },
    laneChange: { ...object({ size_m: number, length_m: number, peakError_m: number }), type: ['object', 'null'] },
    curveEntry: { ...object({ curvature_perM: number, peakError_m: number, errorAfterSettle_m: number }), type: ['object', 'null'] },
    actuator: object({ largestReference: number, limitedBy: { enum: ['angle', 'rate'] }, peakAnglePerUnit: number, peakRatePerUnit: number }),
    limitedStep: { ...object({ size: number, overshoot_pct: number, settlingTime_s: nullableTime, peakSteerRate_radps: number }), type: ['object', 'null'] },
  }),
  type: ['object', 'null'],
};
/** A limit: one number, or a table over speed (linear between its speeds; a plan's expression of speed at its check speeds). */
const limit = {
  oneOf: [
    number,
    {
      type: 'object',
      additionalProperties: false,
      required: ['speeds_mps', 'values'],
      properties: { speeds_mps: { type: 'array', minItems: 1, items: number }, values: { type: 'array', minItems: 1, items: number } },
    },
  ],
} as const;
const timeDomainLimits = object({
  maximumOvershoot_pct: limit,
  maximumRecoveryTime_s: limit,
  maximumLaneChangeError_m: limit,
  maximumCurveEntryError_m: limit,
});

export const SCHEDULE_SCHEMA = object(
  {
    format: { const: 'speedband-schedule' },
    formatVersion: { const: 4 },
    status: { enum: ['passed', 'failed'] },
    vehicle: object({ name: text, file: text, sha256 }),
    loop: object(
      {
        kind: { enum: ['yaw-rate', 'heading', 'path'] },
        referencePoint: { enum: ['cg', 'front-axle'] },
        preview_m: { type: 'number', minimum: 0 },
        previewTime_s: { type: 'number', minimum: 0 },
        error: text,
      },
      ['referencePoint', 'preview_m', 'previewTime_s'],
    ),
    controller: object({
      form: { const: 'parallel' },
      derivativeFilter: { type: 'number', exclusiveMinimum: 0 },
      discretisation: { enum: ['tustin', 'backward-euler'] },
      sampleTime_s: { type: 'number', exclusiveMinimum: 0 },
      computationLatency_s: { type: 'number', minimum: 0 },
      integratorClamp_rad: { type: 'number', exclusiveMinimum: 0 },
      antiWindup: { enum: ['conditional-integration', 'back-calculation'] },
      equation: text,
      feedForward: text,
      update: { type: 'array', items: text },
      integration: text,
    }),
    interpolation: object({
      method: { enum: ['linear', 'monotone-cubic'] },
      outOfRange: { const: 'clamp' },
      lowSpeedFloor_mps: { type: 'number', minimum: 0 },
      description: text,
    }),
    units: object({ speed: { const: 'm/s' }, error: text, output: { const: 'rad' }, kp: text, ki: text, kd: text, feedForward: text, feedForwardInput: text }),
    breakpoints: {
      type: 'array',
      minItems: 1,
      items: object({
        speed_mps: { type: 'number', minimum: 0 },
        kp: number,
        ki: number,
        kd: number,
        setpointWeightProportional: { type: 'number', minimum: 0, maximum: 1 },
        setpointWeightDerivative: { type: 'number', minimum: 0, maximum: 1 },
        feedForward: number,
        feedForwardLeadTime_s: number,
        insertedByRefinement: { type: 'boolean' },
        margins: object({
          stable: { type: 'boolean' },
          verdict: {
            enum: ['stable', 'unstable', 'marginal'],
            description:
              'From the exact closed-loop poles of the sampled loop (each with a bound on its rounding error), cross-checked by the Nyquist count; marginal: a pole on the unit circle within that bound. Margins below are null unless stable.',
          },
          lowerGainMargin_dB: {
            ...nullableNumber,
            description: 'Gain reduction that destabilises (negative dB; conditionally stable loops); null when there is none.',
          },
          upperGainMargin_dB: { ...nullableNumber, description: 'Gain increase that destabilises, dB; null when there is none.' },
          phaseMargin_deg: {
            ...nullableNumber,
            description:
              'Smallest phase change, lag or lead, that puts the loop on −1 at a gain crossover: |180° + ∠L| in (0°, 180°], the smallest over the crossovers (phase lag to the stability limit, Åström & Murray 2008, §9.3; lead counted too). Never negative on a stable loop.',
          },
          delayMargin_s: {
            ...nullableNumber,
            description:
              'Smallest delay added in the loop that destabilises it, s: phase lag over frequency at the gain crossovers, confirmed or shortened by the exact verdict of the loop with that delay added.',
          },
          sensitivityPeak: { ...nullableNumber, description: 'Ms = max |1/(1 + L)| over 0 < ω ≤ π/Ts.' },
          complementarySensitivityPeak: { ...nullableNumber, description: 'Mt = max |L/(1 + L)| over 0 < ω ≤ π/Ts.' },
        }),
        timeDomain: timeDomainFigures,
      }),
    },
    check: object(
      {
        passed: { type: 'boolean' },
        model: object({ kind: { enum: ['single-track', 'interpolated-lumped'] }, description: text }),
        range: object({ minimum_mps: number, maximum_mps: number }),
        gridSpeeds: { type: 'integer', minimum: 2 },
        gridSize: { type: 'integer', minimum: 1 },
        thresholds: object({
          maximumLowerGainMargin_dB: limit,
          minimumUpperGainMargin_dB: limit,
          minimumPhaseMargin_deg: limit,
          maximumSensitivityPeak: limit,
          maximumComplementarySensitivityPeak: limit,
          minimumDelayMargin_s: limit,
        }),
        worst: object({
          lowerGainMargin_dB: worstValue,
          upperGainMargin_dB: worstValue,
          phaseMargin_deg: worstValue,
          delayMargin_s: worstValue,
          sensitivityPeak: worstValue,
          complementarySensitivityPeak: worstValue,
        }),
        failedSpeeds: { type: 'integer', minimum: 0 },
        failures: { type: 'array', items: object({ speed_mps: number, messages: { type: 'array', items: text } }) },
        insertions: { type: 'array', items: object({ speed_mps: number, reason: text }) },
        timeDomain: object({
          passed: { type: 'boolean' },
          limits: timeDomainLimits,
          steeringLimits: object({ maxSteerAngle_rad: { type: 'number', exclusiveMinimum: 0 }, maxSteerRate_radps: { type: 'number', exclusiveMinimum: 0 } }),
          failures: { type: 'array', items: object({ speed_mps: number, messages: { type: 'array', items: text } }) },
        }),
        scenarios: object({
          passed: { type: 'boolean' },
          limits: object({ ...timeDomainLimits.properties, maximumSpeedChangeError: limit }),
          model: text,
          speeds_mps: { type: 'array', items: number },
          scenarios: { type: 'array', items: text },
          failures: { type: 'array', items: object({ speed_mps: number, scenario: text, metric: text, message: text }) },
        }),
        speedChange: object({
          maximumAcceleration_mps2: nullableNumber,
          maximumDeceleration_mps2: nullableNumber,
          searched_mps2: object({ lowest: number, highest: number }),
          statement: text,
        }),
      },
      ['scenarios', 'speedChange'],
    ),
    variations: SCHEDULE_VARIATIONS_SCHEMA,
    provenance: object(
      {
        tool: { const: 'speedband' },
        toolVersion: text,
        inputs: { type: 'array', items: object({ file: text, sha256, role: text }) },
        model: freeObject,
        rule: object(
          {
            name: text,
            parameters: freeObject,
            citation: text,
            parametersAtBreakpoints: {
              type: 'array',
              items: object({ speed_mps: number, parameters: { type: 'object', additionalProperties: { type: ['number', 'string'] } } }),
            },
            tuneFor: { enum: ['rule-parameters', 'fastest-passing'] },
            searchOn: { enum: ['nominal', 'worst-case'] },
            searchAtBreakpoints: {
              type: 'array',
              items: object({
                speed_mps: number,
                parameter: text,
                value: number,
                outcome: { enum: ['fastest passing', 'none passed'] },
                candidates: { type: 'integer', minimum: 1 },
                reason: text,
              }),
            },
          },
          ['citation', 'parametersAtBreakpoints', 'searchOn', 'searchAtBreakpoints'],
        ),
        plan: freeObject,
        handEdits: {
          type: 'array',
          items: object({
            statement: text,
            changedSections: { type: 'array', items: text },
            toolVersion: text,
            model: text,
            gridSize: { type: 'integer', minimum: 1 },
          }),
        },
      },
      ['handEdits'],
    ),
    cautions: { type: 'array', minItems: 1, items: text },
    checksum: object({
      algorithm: { const: 'SHA-256' },
      canonicalForm: text,
      value: sha256,
      sections: { type: 'object', propertyNames: { pattern: '^/' }, additionalProperties: sha256 },
    }),
  },
  ['variations'],
);
