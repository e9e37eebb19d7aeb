/**
 * JSON Schema of a plan file (what `build` is asked to produce). Every field is optional;
 * plan.ts `PLAN_DEFAULTS` fills the rest. Unknown fields are refused (typos get named).
 */
const positive = { type: 'number', exclusiveMinimum: 0 } as const;
const nonNegative = { type: 'number', minimum: 0 } as const;

/**
 * A number, a table of values per speed (linear between, held beyond the ends), or an expression in
 * speed_mps ("max(15, 1.2 * speed_mps)"; src/core/speed-expression.ts checks and compiles it).
 */
const speedVarying = (value: object) =>
  ({
    oneOf: [
      value,
      { type: 'string', minLength: 1, description: 'an expression in speed_mps (m/s), e.g. "max(15, 1.2 * speed_mps)"' },
      {
        type: 'object',
        additionalProperties: false,
        required: ['speeds_mps', 'values'],
        properties: {
          speeds_mps: { type: 'array', minItems: 1, items: nonNegative },
          values: { type: 'array', minItems: 1, items: value },
        },
      },
    ],
  }) as const;

export const PLAN_SCHEMA = {
  $id: 'https://speedband.dev/schema/plan.json',
  title: 'speedband plan',
  type: 'object',
  additionalProperties: false,
  properties: {
    $schema: { type: 'string' },
    description: { type: 'string' },
    loop: {
      type: 'object',
      additionalProperties: false,
      properties: {
        kind: { enum: ['yaw-rate', 'heading', 'path'] },
        preview_m: nonNegative,
        referencePoint: { enum: ['cg', 'front-axle'] },
      },
    },
    rule: {
      type: 'object',
      additionalProperties: false,
      properties: {
        name: { enum: ['ziegler-nichols-step', 'ziegler-nichols-ultimate', 'imc-pid', 'simc', 'damping-target'] },
        parameters: {
          type: 'object',
          additionalProperties: false,
          properties: {
            controllerType: { enum: ['P', 'PI', 'PID'] },
            closedLoopTimeConstant_s: speedVarying(positive),
            simcClosedLoopTimeConstant_s: speedVarying(positive),
            dampingRatio: speedVarying(positive),
            naturalFrequency_radps: speedVarying(positive),
            settlingDistance_m: speedVarying(positive),
            integralPoleRatio: speedVarying(positive),
          },
        },
      },
    },
    speeds: {
      type: 'object',
      additionalProperties: false,
      properties: { minimum_mps: nonNegative, maximum_mps: positive, lowSpeedFloor_mps: positive },
    },
    breakpoints: {
      oneOf: [
        {
          type: 'object',
          additionalProperties: false,
          required: ['speeds_mps'],
          properties: { speeds_mps: { type: 'array', minItems: 1, items: positive } },
        },
        {
          type: 'object',
          additionalProperties: false,
          properties: { count: { type: 'integer', minimum: 1, maximum: 100 }, spacing: { enum: ['geometric', 'linear'] } },
        },
      ],
    },
    interpolation: { enum: ['linear', 'monotone-cubic'] },
    controller: {
      type: 'object',
      additionalProperties: false,
      properties: {
        form: { enum: ['parallel'] },
        derivativeFilter: positive,
        sampleTime_s: positive,
        discretisation: { enum: ['tustin', 'backward-euler'] },
        computationLatency_s: nonNegative,
      },
    },
    acceptance: {
      type: 'object',
      additionalProperties: false,
      properties: {
        maximumLowerGainMargin_dB: { type: 'number', maximum: 0 },
        minimumUpperGainMargin_dB: nonNegative,
        minimumPhaseMargin_deg: { type: 'number', minimum: 0, maximum: 180 },
        maximumSensitivityPeak: { type: 'number', minimum: 1 },
        delayMarginRoom_s: nonNegative,
      },
    },
    check: {
      type: 'object',
      additionalProperties: false,
      properties: {
        gridSpeeds: { type: 'integer', minimum: 2, maximum: 100000 },
        maxInsertedBreakpoints: { type: 'integer', minimum: 0, maximum: 100 },
        model: { enum: ['single-track', 'interpolated-lumped'] },
      },
    },
  },
} as const;
