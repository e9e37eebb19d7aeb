/**
 * JSON Schema of the plan's `variations` section: the vehicles the schedule must hold on besides the
 * nominal model (load, tyres, latency, actuator, the identification's own uncertainty) and how the worst
 * case over them is searched. Defaults and their sources: VARIATION_DEFAULTS (plan-variations.ts).
 */
const described = <T extends object>(schema: T, description: string) => ({ ...schema, description }) as const;

/** ± a percentage, or [down, up] percentages around the nominal value (down ≤ 0 ≤ up). */
const percentRange = (description: string) =>
  described(
    {
      oneOf: [
        { type: 'number', minimum: 0, maximum: 90, description: '± this many percent' },
        {
          type: 'array',
          minItems: 2,
          maxItems: 2,
          items: [
            { type: 'number', minimum: -90, maximum: 0 },
            { type: 'number', minimum: 0, maximum: 900 },
          ],
          description: '[down, up] percent, down ≤ 0 ≤ up',
        },
      ],
    },
    description,
  );

export const PLAN_VARIATIONS_SCHEMA = described(
  {
    type: 'object',
    additionalProperties: false,
    properties: {
      acceptance: described(
        { enum: ['robust', 'nominal'] },
        'What the schedule must pass: robust — the acceptance limits at the worst case over the variations at every check speed (and the nominal check); nominal — the nominal check only, the worst case reported beside it.',
      ),
      mass_pct: percentRange('Vehicle mass change (load): ± percent, or [down, up] percent.'),
      yawInertia_pct: percentRange('Yaw inertia change (load): ± percent, or [down, up] percent.'),
      cgRearwardShift_m: described(
        {
          oneOf: [
            { type: 'number', minimum: 0, maximum: 5, description: '± this many metres' },
            {
              type: 'array',
              minItems: 2,
              maxItems: 2,
              items: [
                { type: 'number', minimum: -5, maximum: 0 },
                { type: 'number', minimum: 0, maximum: 5 },
              ],
            },
          ],
        },
        'Centre of gravity moving rearward (load): ± metres, or [forward as a negative number, rearward] metres; the wheelbase stays, so the CG-to-front-axle distance grows by it and the CG-to-rear-axle distance shrinks.',
      ),
      frontCorneringStiffness_pct: percentRange('Front cornering stiffness change (tyres, inflation, temperature, road): ± percent, or [down, up] percent.'),
      rearCorneringStiffness_pct: percentRange('Rear cornering stiffness change (tyres, inflation, temperature, road): ± percent, or [down, up] percent.'),
      actuatorLag_pct: percentRange('Steering actuator lag change (wear, temperature, supply): ± percent, or [down, up] percent.'),
      addedLatency_s: described(
        { type: 'number', minimum: 0, maximum: 1 },
        'Extra delay in the loop, from 0 up to this (a late computation, bus jitter, a slower actuator); from 0 s to 1 s.',
      ),
      fromIdentification: described(
        { type: 'boolean' },
        "Also vary the identified parameters over their 95 % intervals from models.json: the joint single-track fit's cornering stiffnesses, actuator lag and delay (the plan's percentages apply beyond the interval's ends), or on the interpolated lumped models each FOPDT gain, time constant and dead time (the widest relative interval over the test speeds).",
      ),
      search: described(
        {
          type: 'object',
          additionalProperties: false,
          properties: {
            samples: described(
              { type: 'integer', minimum: 0, maximum: 4096 },
              'Seeded points inside the box at each check speed, besides its corners (every corner up to 4 varied parameters; beyond, a screening of each parameter and a search over the corners).',
            ),
            seed: described(
              { type: 'integer', minimum: 0, maximum: 4294967295 },
              'Seed of those points (the same points at every speed; the same seed gives the same schedule).',
            ),
            localSearchEvaluations: described(
              { type: 'integer', minimum: 0, maximum: 1000 },
              'Most loop analyses of the compass search (Kolda, Lewis & Torczon 2003) from the worst points found, per speed, shared by the figures in turn (phase margin first); 0 switches the local search off.',
            ),
          },
        },
        'How the worst case is searched at each check speed: corners, seeded samples, then a compass search.',
      ),
    },
  },
  'The vehicles the schedule must hold on besides the nominal model: a box of parameter changes around it. Without this section the schedule is checked on the nominal model only.',
);
