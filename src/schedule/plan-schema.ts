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
        kind: { enum: ['yaw-rate', 'heading', 'path'], description: 'The loop the firmware closes: yaw rate (rad/s), heading (rad) or path (lateral offset at a preview point, m). Default yaw-rate.' },
        preview_m: { ...nonNegative, description: 'Path loop: preview distance ahead of the reference point at standstill, m. Default 0.5 m when neither preview_m nor previewTime_s is given, else 0.' },
        previewTime_s: {
          ...nonNegative,
          description: 'Path loop: preview time, s — the preview grows with speed: preview_m + previewTime_s × speed ahead of the reference point. Default 0.3 s when neither preview_m nor previewTime_s is given, else 0.',
        },
        referencePoint: { enum: ['cg', 'front-axle'], description: 'Path loop: where the preview is measured from. Default front-axle.' },
      },
    },
    rule: {
      type: 'object',
      additionalProperties: false,
      properties: {
        name: {
          enum: ['ziegler-nichols-step', 'ziegler-nichols-ultimate', 'imc-pid', 'simc', 'damping-target', 'amigo', 'migo'],
          description: 'The tuning rule. Default per loop kind: yaw-rate simc; heading simc searched (tuneFor fastest-passing); path migo searched.',
        },
        tuneFor: {
          enum: ['rule-parameters', 'fastest-passing'],
          description:
            "How each breakpoint's free rule parameter is chosen: rule-parameters (as given, or the rule's default; the default when a rule is named) or fastest-passing (a search for the fastest response meeting every acceptance limit at that breakpoint on the full loop: SIMC/IMC closed-loop time constant, damping-target natural frequency, MIGO sensitivity-peak target).",
        },
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
            sensitivityPeakTarget: { ...speedVarying(positive), description: 'MIGO: the bound M on both sensitivity peaks, Ms ≤ M and Mt ≤ M (default 1.4).' },
            phaseMarginTarget_deg: {
              ...speedVarying(positive),
              description: 'MIGO: also keep the phase margin at least this, degrees (no default; a fastest-passing search sets the plan limit).',
            },
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
        antiWindup: {
          enum: ['conditional-integration', 'back-calculation'],
          description:
            'Anti-windup while the command is at the steering-angle limit (Åström & Hägglund 2006, §3.5): conditional-integration (the default: the integral stops while the command is limited and the error would push it further) or back-calculation (the integral tracks the limited command with tracking time Tt = √(Ti·Td), Ti when kd = 0).',
        },
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
        maximumComplementarySensitivityPeak: { type: 'number', minimum: 1, description: 'Peak of |T| = |L/(1 + L)| at most this (default 2).' },
        delayMarginRoom_s: nonNegative,
        maximumOvershoot_pct: { ...nonNegative, description: 'Reference step (with the set-point weights chosen for it): overshoot at most this, % (default 25).' },
        maximumRecoveryTime_s: { ...positive, description: 'A 0.01 rad steering misalignment and a lateral force step of 5 % of the weight removed to 5 % of their peak error within this, s (default 15).' },
        maximumLaneChangeError_m: { ...positive, description: 'Path loop: largest error while following a 3.5 m lane change over max(4 s of travel, 20 m), m (default 0.5).' },
        maximumCurveEntryError_m: { ...positive, description: 'Path loop: largest error from 3 s after entering a constant-curvature curve (2 m/s² or half the steering range), m (default 0.3).' },
        maximumSpeedChangeError_m: { ...positive, description: 'Path loop: largest error while accelerating (1 m/s²) or braking (2 m/s²) through the speed range in a curve, m (default 0.3).' },
        maximumSpeedChangeError_rad: { ...positive, description: 'Heading loop: largest error while the speed changes through the range in a curve, rad (default 0.05).' },
        maximumSpeedChangeError_radps: { ...positive, description: 'Yaw-rate loop: largest error while the speed changes through the range in a curve, rad/s (default 0.05).' },
      },
    },
    check: {
      type: 'object',
      additionalProperties: false,
      properties: {
        gridSpeeds: { type: 'integer', minimum: 2, maximum: 100000 },
        maxInsertedBreakpoints: { type: 'integer', minimum: 0, maximum: 100 },
        model: { enum: ['single-track', 'interpolated-lumped'] },
        scenarios: {
          type: 'boolean',
          description:
            'Drive the schedule through the scenarios of `speedband simulate` at each breakpoint, at low, middle and top speed and through the speed range, and pass only when they keep the scenario limits (default true; needs the single-track model).',
        },
      },
    },
  },
} as const;
