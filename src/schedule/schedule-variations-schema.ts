/**
 * JSON Schema of the schedule file's `variations` section (schedule-variations.ts). Every key is required
 * where the record always has it, so that a file cannot drop part of what the robust check found.
 */
const number = { type: 'number' } as const;
const text = { type: 'string' } as const;
const object = (properties: Record<string, object>, optional: readonly string[] = []) => ({
  type: 'object',
  additionalProperties: false,
  required: Object.keys(properties).filter((key) => !optional.includes(key)),
  properties,
});
/** An object or null (JSON Schema applies `required` and `properties` to objects only). */
const objectOrNull = (properties: Record<string, object>) => ({ ...object(properties), type: ['object', 'null'] });
/** A definition of this schema, by reference: Ajv's generated validator then checks it in one function. */
const ref = (name: string) => ({ $ref: `#/definitions/${name}` });

const PARAMETERS = [
  'mass_kg',
  'yawInertia_kgm2',
  'cgToFrontAxle_m',
  'frontCorneringStiffness_NPerRad',
  'rearCorneringStiffness_NPerRad',
  'actuatorLag_s',
  'actuatorDelay_s',
  'gain',
  'timeConstant_s',
  'deadTime_s',
] as const;
const FIGURES = ['phaseMargin_deg', 'upperGainMargin_dB', 'lowerGainMargin_dB', 'delayMargin_s', 'sensitivityPeak', 'complementarySensitivityPeak'] as const;

const TIME_DOMAIN_FIGURES = [
  'overshoot_pct',
  'settlingTime_s',
  'misalignmentRecoveryTime_s',
  'lateralForceRecoveryTime_s',
  'laneChangeError_m',
  'curveEntryError_m',
  'limitedStepOvershoot_pct',
  'limitedStepSettlingTime_s',
] as const;

const figureMap = (definition: string) => object(Object.fromEntries(FIGURES.map((name) => [name, ref(definition)])));

export const SCHEDULE_VARIATIONS_SCHEMA = {
  $id: 'https://speedband.dev/schema/schedule-variations.json',
  ...object({
    acceptance: { enum: ['robust', 'nominal'] },
    passed: { type: 'boolean' },
    set: object({
      model: { enum: ['single-track', 'interpolated-lumped'] },
      dimensions: {
        type: 'array',
        items: object({ parameter: { enum: PARAMETERS }, change: { enum: ['scale', 'add'] }, minimum: number, maximum: number, source: text }),
      },
      notApplied: { type: 'array', items: object({ field: text, reason: text }) },
    }),
    search: object({
      samples: { type: 'integer', minimum: 0 },
      seed: { type: 'integer', minimum: 0 },
      localSearchEvaluations: { type: 'integer', minimum: 0 },
      method: text,
    }),
    gridSize: { type: 'integer', minimum: 1 },
    failedSpeeds: { type: 'integer', minimum: 0 },
    unstableSpeeds: { type: 'integer', minimum: 0 },
    loopAnalyses: { type: 'integer', minimum: 0 },
    worst: figureMap('worstOverGrid'),
    failures: { type: 'array', items: object({ speed_mps: number, messages: { type: 'array', items: text } }) },
    breakpoints: {
      type: 'array',
      items: object({
        speed_mps: number,
        instability: ref('instability'),
        worst: figureMap('worstAtSpeed'),
        timeDomain: ref('timeDomain'),
        weakest: ref('weakest'),
      }),
    },
    weakest: ref('weakest'),
  }),
  definitions: {
    combination: {
      type: 'object',
      additionalProperties: false,
      properties: Object.fromEntries(PARAMETERS.map((name) => [name, number])),
      description:
        "The change of each varied parameter behind a figure: a factor (scale) or an offset in the parameter's unit (add), as the set's dimensions say.",
    },
    worstOverGrid: objectOrNull({ value: number, speed_mps: number, combination: ref('combination') }),
    worstAtSpeed: objectOrNull({ value: number, combination: ref('combination') }),
    timeDomain: {
      ...objectOrNull({
        worst: object(Object.fromEntries(TIME_DOMAIN_FIGURES.map((name) => [name, ref('worstTimeDomain')]))),
        failures: { type: 'array', items: text },
        vehicles: { type: 'integer', minimum: 0 },
      }),
      description:
        "The worst time-domain figures of the breakpoint's gains, set-point weights and feed-forward over the set (the nominal vehicle, the corners, the combinations behind the worst margins); null when not simulated.",
    },
    worstTimeDomain: {
      ...objectOrNull({ value: { type: ['number', 'null'] }, combination: ref('combination') }),
      description:
        'A worst time-domain figure (value null: the response did not settle within the simulated time) and its combination; null where the loop has no such figure.',
    },
    instability: objectOrNull({
      verdict: { enum: ['unstable', 'marginal'] },
      combination: ref('combination'),
      largestPoleMagnitude: { type: ['number', 'null'] },
    }),
    weakest: {
      ...objectOrNull({
        speed_mps: number,
        figure: { enum: ['stability', ...FIGURES] },
        parameter: { enum: PARAMETERS },
        worst: { type: ['number', 'null'] },
        withParameterNominal: { type: ['number', 'null'] },
        restoresStability: { type: ['boolean', 'null'] },
        combination: ref('combination'),
      }),
      description:
        'At a speed, the figure nearest its limit over the set (relative to the limit), and of the parameters changed behind it the one whose return to nominal alone recovers most.',
    },
  },
  description:
    'The worst case over a set of vehicles around the check model (plan "variations"): per grid speed the worst lower and upper gain margin, phase margin, delay margin, Ms and Mt over the set, each with the parameter changes behind it; a set holding an unstable loop is the worst case of all.',
} as const;
