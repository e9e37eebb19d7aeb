/**
 * The plan's `variations` section (schema: plan-variations-schema.ts): the box of vehicle changes the
 * schedule must hold on, as written and as resolved with its defaults. Without the section the schedule
 * is checked on the nominal model only; with it (even `{}`) every default below applies.
 */
import type { RobustSearchSettings } from './variation-types.js';

/** [down, up] around the nominal value: percent, or metres for the CG shift; down ≤ 0 ≤ up. */
export type ChangeRange = readonly [number, number];
/** As a plan writes a range: ± one number, or [down, up]. */
export type WrittenRange = number | readonly [number, number];

/** The plan's variations, resolved: acceptance (robust or nominal) and the range of each varied vehicle parameter. */
export interface PlanVariations {
  /** robust: the limits hold at the worst case over the set too; nominal: the worst case is reported only. */
  readonly acceptance: 'robust' | 'nominal';
  readonly mass_pct: ChangeRange;
  readonly yawInertia_pct: ChangeRange;
  readonly cgRearwardShift_m: ChangeRange;
  readonly frontCorneringStiffness_pct: ChangeRange;
  readonly rearCorneringStiffness_pct: ChangeRange;
  readonly actuatorLag_pct: ChangeRange;
  /** Extra loop delay from 0 up to this, s. */
  readonly addedLatency_s: number;
  /** Also vary the identified parameters over their 95 % intervals. */
  readonly fromIdentification: boolean;
  readonly search: RobustSearchSettings;
}

/** The section as a plan file writes it: every field optional. */
export interface WrittenVariations {
  readonly acceptance?: 'robust' | 'nominal';
  readonly mass_pct?: WrittenRange;
  readonly yawInertia_pct?: WrittenRange;
  readonly cgRearwardShift_m?: WrittenRange;
  readonly frontCorneringStiffness_pct?: WrittenRange;
  readonly rearCorneringStiffness_pct?: WrittenRange;
  readonly actuatorLag_pct?: WrittenRange;
  readonly addedLatency_s?: number;
  readonly fromIdentification?: boolean;
  readonly search?: Partial<RobustSearchSettings>;
}

/**
 * Defaults, in one place; each source is in the plan reference (plan-reference.ts). Common practice, from
 * memory: a road vehicle's load moves its mass and yaw inertia by about ±10 %; tyre wear, inflation,
 * temperature and dry road surfaces move cornering stiffness by about ±20 %; an actuator's lag varies by
 * about ±20 % over temperature, supply voltage and wear. Our choices: no CG shift (it depends on where the
 * load sits: give it), one sample of added latency (a late computation or bus jitter: `null` here, resolved
 * from the controller's sample time), the identification's intervals included, robust acceptance, 64 seeded
 * samples, 24 local-search analyses per figure.
 */
export const VARIATION_DEFAULTS = {
  acceptance: 'robust',
  mass_pct: 10,
  yawInertia_pct: 10,
  cgRearwardShift_m: 0,
  frontCorneringStiffness_pct: 20,
  rearCorneringStiffness_pct: 20,
  actuatorLag_pct: 20,
  addedLatency_s: null,
  fromIdentification: true,
  search: { samples: 64, seed: 1, localSearchEvaluations: 24 },
} as const;

const range = (written: WrittenRange | undefined, fallback: number): ChangeRange => {
  const value = written ?? fallback;
  return typeof value === 'number' ? [value === 0 ? 0 : -value, value] : [value[0], value[1]];
};

/** The section with every default applied; the added latency defaults to one sample of the controller. */
export function resolveVariations(written: WrittenVariations, sampleTime_s: number): PlanVariations {
  const d = VARIATION_DEFAULTS;
  return {
    acceptance: written.acceptance ?? d.acceptance,
    mass_pct: range(written.mass_pct, d.mass_pct),
    yawInertia_pct: range(written.yawInertia_pct, d.yawInertia_pct),
    cgRearwardShift_m: range(written.cgRearwardShift_m, d.cgRearwardShift_m),
    frontCorneringStiffness_pct: range(written.frontCorneringStiffness_pct, d.frontCorneringStiffness_pct),
    rearCorneringStiffness_pct: range(written.rearCorneringStiffness_pct, d.rearCorneringStiffness_pct),
    actuatorLag_pct: range(written.actuatorLag_pct, d.actuatorLag_pct),
    addedLatency_s: written.addedLatency_s ?? sampleTime_s,
    fromIdentification: written.fromIdentification ?? d.fromIdentification,
    search: { ...d.search, ...written.search },
  };
}
