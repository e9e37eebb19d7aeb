/**
 * JSON Schema of a plan file (what `build` is asked to produce). Every field is optional;
 * plan.ts `PLAN_DEFAULTS` fills the rest. Unknown fields are refused (typos get named).
 */
import { PLAN_VARIATIONS_SCHEMA } from './plan-variations-schema.js';

const positive = { type: 'number', exclusiveMinimum: 0 } as const;
const nonNegative = { type: 'number', minimum: 0 } as const;
/** A field with its description (the plan reference, docs/plan.md, is generated from these: src/schedule/plan-reference.ts). */
const described = <T extends object>(schema: T, description: string) => ({ ...schema, description }) as const;

/**
 * A number, a table of values per speed (linear between, held beyond the ends), or an expression in
 * speed_mps ("max(15, 1.2 * speed_mps)"; src/core/speed-expression.ts checks and compiles it).
 */
const speedVarying = (value: object, description: string) =>
  ({
    description,
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
    $schema: described({ type: 'string' }, 'Optional pointer to this schema; ignored.'),
    description: described({ type: 'string' }, 'Free text for the reader; recorded in the schedule with the plan.'),
    loop: described(
      {
        type: 'object',
        additionalProperties: false,
        properties: {
          kind: described(
            { enum: ['yaw-rate', 'heading', 'path'] },
            'The loop the firmware closes: yaw-rate (steer command → yaw rate), heading (→ heading, one integrator) or path (→ lateral offset at the preview point, two integrators).',
          ),
          preview_m: described(
            nonNegative,
            'Path loop: preview distance d at standstill, m; the error is e = ey + d·eψ (a preview adds a lead that can make a P or PD path loop stable). Default 0.5 m when neither preview_m nor previewTime_s is given, else 0.',
          ),
          previewTime_s: described(
            nonNegative,
            'Path loop: preview time, s — the preview grows with speed: preview_m + previewTime_s × speed ahead of the reference point. Default 0.3 s when neither preview_m nor previewTime_s is given, else 0.',
          ),
          referencePoint: described(
            { enum: ['cg', 'front-axle'] },
            'Path loop: where the preview is measured from; front-axle (the default) adds the CG-to-front-axle distance.',
          ),
        },
      },
      'The loop the firmware closes.',
    ),
    rule: described(
      {
        type: 'object',
        additionalProperties: false,
        properties: {
          name: described(
            { enum: ['ziegler-nichols-step', 'ziegler-nichols-ultimate', 'imc-pid', 'simc', 'damping-target', 'amigo', 'migo'] },
            'The published tuning rule applied at each breakpoint (the table of rules below names each source). Default per loop kind: yaw-rate simc; heading simc searched (tuneFor fastest-passing); path migo searched.',
          ),
          tuneFor: described(
            { enum: ['rule-parameters', 'fastest-passing'] },
            "How each breakpoint's free rule parameter is chosen: rule-parameters (as given, or the rule's default; the default when a rule is named) or fastest-passing (a search for the fastest response meeting every acceptance limit at that breakpoint on the full loop: SIMC/IMC closed-loop time constant, damping-target natural frequency, MIGO sensitivity-peak target).",
          ),
          searchOn: described(
            { enum: ['nominal', 'worst-case'] },
            "With tuneFor fastest-passing: what each candidate must pass — nominal (every acceptance limit on the nominal model) or worst-case (also in the worst case over the plan's variations: the margins as the robust check finds them at that breakpoint, and the time-domain figures over the set). Default worst-case when the plan has variations under robust acceptance, else nominal.",
          ),
          parameters: described(
            {
              type: 'object',
              additionalProperties: false,
              properties: {
                controllerType: described(
                  { enum: ['P', 'PI', 'PID'] },
                  'Which terms the controller has (Ziegler–Nichols rows; SIMC: by plant class when absent).',
                ),
                closedLoopTimeConstant_s: speedVarying(positive, 'IMC-PID closed-loop time constant λ (Rivera, Morari & Skogestad 1986).'),
                simcClosedLoopTimeConstant_s: speedVarying(
                  positive,
                  'SIMC closed-loop time constant τc (Skogestad 2003; τc = θ is "tight control with good robustness").',
                ),
                dampingRatio: speedVarying(positive, 'Damping-target ζ of the closed-loop pole pair.'),
                naturalFrequency_radps: speedVarying(positive, 'Damping-target ωn of the pole pair (wins over settlingDistance_m).'),
                settlingDistance_m: speedVarying(positive, 'Damping-target settling distance D: ωn = 4·v/(ζ·D) (settling time ≈ 4/(ζωn), common practice).'),
                integralPoleRatio: speedVarying(positive, 'Damping-target ratio ωn/p of the natural frequency to the integral pole p.'),
                sensitivityPeakTarget: speedVarying(
                  positive,
                  'MIGO: the bound M on both sensitivity peaks, Ms ≤ M and Mt ≤ M (default 1.4; Åström, Panagopoulos & Hägglund 1998).',
                ),
                phaseMarginTarget_deg: speedVarying(
                  positive,
                  'MIGO: also keep the phase margin at least this, degrees (no default; a fastest-passing search sets the plan limit).',
                ),
              },
            },
            "The rule's parameters: only those the rule takes (any other is refused). Each number may be one number, a table over speed or an expression in speed_mps.",
          ),
        },
      },
      'The tuning rule and its parameters.',
    ),
    speeds: described(
      {
        type: 'object',
        additionalProperties: false,
        properties: {
          minimum_mps: described(nonNegative, 'Bottom of the speed range the dense check covers.'),
          maximum_mps: described(positive, 'Top of the speed range the dense check covers.'),
          lowSpeedFloor_mps: described(
            positive,
            'Below this speed the gains of the floor are used (gains grow like 1/v² towards standstill); automatic breakpoints start here.',
          ),
        },
      },
      'The speed range of the schedule.',
    ),
    breakpoints: described(
      {
        oneOf: [
          {
            type: 'object',
            additionalProperties: false,
            required: ['speeds_mps'],
            properties: { speeds_mps: described({ type: 'array', minItems: 1, items: positive }, 'Explicit breakpoint speeds, strictly increasing.') },
          },
          {
            type: 'object',
            additionalProperties: false,
            properties: {
              count: described({ type: 'integer', minimum: 1, maximum: 100 }, 'Number of automatic breakpoints from the floor to the top of the range.'),
              spacing: described(
                { enum: ['geometric', 'linear'] },
                'Spacing of automatic breakpoints; geometric puts more at low speed, where gains change fastest.',
              ),
            },
          },
        ],
      },
      'Where gains are tuned: explicit speeds, or a count and spacing.',
    ),
    interpolation: described(
      { enum: ['linear', 'monotone-cubic'] },
      'How the firmware interpolates between breakpoints: linear, or monotone cubic (Fritsch & Carlson 1980: no overshoot between breakpoints).',
    ),
    controller: described(
      {
        type: 'object',
        additionalProperties: false,
        properties: {
          form: described({ enum: ['parallel'] }, 'Gains are stored in parallel form u = kp·e + ki·∫e + kd·ė (filtered).'),
          derivativeFilter: described(positive, 'Derivative filter factor N: filter time constant Tf = (kd/kp)/N (common practice N ≈ 10); from 1 to 1,000.'),
          sampleTime_s: described(positive, "Sample time Ts of the firmware's controller; from 0.0001 s (10 kHz) to 1 s."),
          discretisation: described(
            { enum: ['tustin', 'backward-euler'] },
            "How the firmware discretises the integral and the derivative filter (backward Euler's filter pole stays in [0, 1): no ringing).",
          ),
          computationLatency_s: described(nonNegative, 'Time from taking a sample to the steer command it produces; from 0 s to 1 s.'),
          antiWindup: described(
            { enum: ['conditional-integration', 'back-calculation'] },
            'Anti-windup while the command is at the steering-angle limit (Åström & Hägglund 2006, §3.5): conditional-integration (the default: the integral stops while the command is limited and the error would push it further) or back-calculation (the integral tracks the limited command with tracking time Tt = √(Ti·Td), Ti when kd = 0).',
          ),
        },
      },
      'The controller the firmware runs (the same defaults as speedband tune and speedband stability).',
    ),
    acceptance: described(
      {
        type: 'object',
        additionalProperties: false,
        properties: {
          maximumLowerGainMargin_dB: speedVarying(
            { type: 'number', maximum: 0 },
            'Lower gain margin (negative: the gain reduction that destabilises a conditionally stable loop) must be at most this.',
          ),
          minimumUpperGainMargin_dB: speedVarying(nonNegative, 'Upper gain margin (the gain increase that destabilises) must be at least this.'),
          minimumPhaseMargin_deg: speedVarying({ type: 'number', minimum: 0, maximum: 180 }, 'Phase margin must be at least this.'),
          maximumSensitivityPeak: speedVarying(
            { type: 'number', minimum: 1 },
            'Peak sensitivity Ms = max |1/(1 + L)| must be at most this (1.4–2 is the usual robust range, Åström & Hägglund).',
          ),
          maximumComplementarySensitivityPeak: speedVarying(
            { type: 'number', minimum: 1 },
            'Peak complementary sensitivity Mt = max |L/(1 + L)| must be at most this (default 2).',
          ),
          delayMarginRoom_s: speedVarying(nonNegative, 'Required delay margin = computation latency + Ts/2 (the hold) + this room.'),
          maximumOvershoot_pct: speedVarying(
            nonNegative,
            'Reference step (with the set-point weights chosen for it): overshoot at most this, % (default 25, common practice).',
          ),
          maximumRecoveryTime_s: speedVarying(
            positive,
            'A 0.01 rad steering misalignment and a lateral force step of 5 % of the weight removed to 5 % of their peak error within this, s (default 15).',
          ),
          maximumLaneChangeError_m: speedVarying(
            positive,
            'Path loop: largest error while following a 3.5 m lane change over max(4 s of travel, 20 m), m (default 0.5).',
          ),
          maximumCurveEntryError_m: speedVarying(
            positive,
            'Path loop: largest error from 3 s after entering a constant-curvature curve (2 m/s² or half the steering range), m (default 0.3).',
          ),
          maximumSpeedChangeError_m: speedVarying(
            positive,
            'Path loop: largest error while accelerating (1 m/s²) or braking (2 m/s²) through the speed range in a curve, m (default 0.3).',
          ),
          maximumSpeedChangeError_rad: speedVarying(
            positive,
            'Heading loop: largest error while the speed changes through the range in a curve, rad (default 0.05).',
          ),
          maximumSpeedChangeError_radps: speedVarying(
            positive,
            'Yaw-rate loop: largest error while the speed changes through the range in a curve, rad/s (default 0.05).',
          ),
        },
      },
      'Limits every speed of the dense check and of the scenarios must meet. Each may be one number, a table over speed or an expression in speed_mps (e.g. "minimumPhaseMargin_deg": "max(35, 50 - speed_mps)"); the values at each breakpoint are recorded in the schedule.',
    ),
    check: described(
      {
        type: 'object',
        additionalProperties: false,
        properties: {
          gridSpeeds: described(
            { type: 'integer', minimum: 2, maximum: 100000 },
            'Evenly spaced check speeds across the range (breakpoints and midpoints are added).',
          ),
          maxInsertedBreakpoints: described(
            { type: 'integer', minimum: 0, maximum: 100 },
            'Most breakpoints the refinement may insert where the check fails between breakpoints.',
          ),
          model: described(
            { enum: ['single-track', 'interpolated-lumped'] },
            'Model the schedule is tuned and checked on: the joint single-track fit, or the per-speed models interpolated in speed (used anyway when the joint fit was refused).',
          ),
          scenarios: described(
            { type: 'boolean' },
            'Drive the schedule through the scenarios of `speedband simulate` at each breakpoint, at low, middle and top speed and through the speed range, and pass only when they keep the scenario limits (needs the single-track model).',
          ),
          rampAcceleration_mps2: described(
            { type: 'number', exclusiveMinimum: 0, maximum: 10 },
            'Acceleration of the speed-ramp-in-curve scenario through the speed range, m/s²: the acceleration the vehicle uses in service.',
          ),
          brakingDeceleration_mps2: described(
            { type: 'number', exclusiveMinimum: 0, maximum: 10 },
            'Deceleration of the braking-in-curve scenario through the speed range, m/s² (positive): the service braking the vehicle uses, not an emergency stop.',
          ),
        },
      },
      'The dense check.',
    ),
    variations: PLAN_VARIATIONS_SCHEMA,
  },
} as const;
