/**
 * The vehicle model the schedule is tuned and checked on, at any speed of the range:
 * the joint single-track fit (valid between and beyond the test speeds, docs/domain.md §3), or —
 * when that fit was refused or the plan asks for it — the per-speed FOPDT models interpolated
 * linearly in speed between the test speeds and held at the end values beyond them.
 * The summary written into a schedule's provenance holds every number needed to rebuild it.
 */
import { SpeedbandError } from '../core/errors.js';
import type { FopdtModel } from '../identify/types.js';
import type { ModelsFile } from '../identify/models-schema.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';
import type { SingleTrackParameters, Vehicle } from '../vehicle/types.js';

export type CheckModelKind = 'single-track' | 'interpolated-lumped';

/** One per-speed FOPDT model (command → yaw rate, actuator included). */
export interface LumpedAtSpeed {
  readonly speed_mps: number;
  readonly gain: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
}

/** JSON-able summary of a check model, as stored in `provenance.model` of a schedule. */
export type CheckModelSummary =
  | ({ readonly kind: 'single-track'; readonly understeerGradient_radPerMps2: number } & SingleTrackParameters)
  | { readonly kind: 'interpolated-lumped'; readonly cgToFrontAxle_m: number; readonly speeds: readonly LumpedAtSpeed[] };

export interface CheckModel {
  readonly kind: CheckModelKind;
  /** In words, for the schedule file and the terminal: which model and why. */
  readonly description: string;
  readonly summary: CheckModelSummary;
  /** The model at a speed, m/s, in the form the tuning and loop code take. */
  readonly modelAt: (speed_mps: number) => OperatingPointModel;
}

/** Rebuild a check model from its summary (e.g. a schedule's `provenance.model`). */
export function checkModelFromSummary(summary: CheckModelSummary, description: string): CheckModel {
  if (summary.kind === 'single-track') {
    const parameters: SingleTrackParameters = {
      mass_kg: summary.mass_kg,
      yawInertia_kgm2: summary.yawInertia_kgm2,
      cgToFrontAxle_m: summary.cgToFrontAxle_m,
      cgToRearAxle_m: summary.cgToRearAxle_m,
      frontCorneringStiffness_NPerRad: summary.frontCorneringStiffness_NPerRad,
      rearCorneringStiffness_NPerRad: summary.rearCorneringStiffness_NPerRad,
      actuatorLag_s: summary.actuatorLag_s,
      actuatorDelay_s: summary.actuatorDelay_s,
    };
    const model: OperatingPointModel = { kind: 'single-track', parameters };
    return { kind: 'single-track', description, summary, modelAt: () => model };
  }
  const speeds = [...summary.speeds].sort((p, q) => p.speed_mps - q.speed_mps);
  if (speeds.length === 0) {
    throw new SpeedbandError('build.noModel', 'the lumped model has no speeds — identify at least two test speeds');
  }
  return {
    kind: 'interpolated-lumped',
    description,
    summary: { ...summary, speeds },
    modelAt: (speed_mps) => ({ kind: 'lumped', yawRate: lumpedAt(speeds, speed_mps), cgToFrontAxle_m: summary.cgToFrontAxle_m }),
  };
}

/** FOPDT parameters linear in speed between the test speeds; the end models held beyond them. */
export function lumpedAt(speeds: readonly LumpedAtSpeed[], speed_mps: number): FopdtModel {
  let below = speeds[0];
  let above = speeds[speeds.length - 1];
  if (speed_mps <= below.speed_mps) above = below;
  else if (speed_mps >= above.speed_mps) below = above;
  else {
    let k = 0;
    while (speeds[k + 1].speed_mps < speed_mps) k += 1;
    below = speeds[k];
    above = speeds[k + 1];
  }
  const span = above.speed_mps - below.speed_mps;
  const t = span > 0 ? (speed_mps - below.speed_mps) / span : 0;
  const mix = (p: number, q: number): number => p + t * (q - p);
  return {
    kind: 'fopdt',
    gain: mix(below.gain, above.gain),
    timeConstant_s: mix(below.timeConstant_s, above.timeConstant_s),
    deadTime_s: mix(below.deadTime_s, above.deadTime_s),
  };
}

/**
 * The check model from identification results and the vehicle file. `preferred` is the plan's
 * choice; a refused joint single-track fit falls back to interpolated lumped models, and the
 * description says so (it is recorded in the schedule).
 */
export function checkModelFromModels(models: ModelsFile, vehicle: Vehicle, preferred: CheckModelKind): CheckModel {
  const fit = models.singleTrack;
  if (preferred === 'single-track' && fit !== null) {
    const summary: CheckModelSummary = {
      kind: 'single-track',
      mass_kg: vehicle.mass_kg,
      yawInertia_kgm2: vehicle.yawInertia_kgm2,
      cgToFrontAxle_m: vehicle.cgToFrontAxle_m,
      cgToRearAxle_m: vehicle.cgToRearAxle_m,
      frontCorneringStiffness_NPerRad: fit.frontCorneringStiffness_NPerRad,
      rearCorneringStiffness_NPerRad: fit.rearCorneringStiffness_NPerRad,
      actuatorLag_s: fit.actuatorLag_s,
      actuatorDelay_s: fit.actuatorDelay_s,
      understeerGradient_radPerMps2: fit.understeerGradient_radPerMps2,
    };
    return checkModelFromSummary(
      summary,
      `joint single-track fit over ${fit.stepCount} steps (R² ${fit.r2.toFixed(3)}), mass, inertia and geometry from the vehicle file`,
    );
  }
  const reason =
    preferred === 'interpolated-lumped'
      ? 'the plan asks for interpolated lumped models'
      : `the joint single-track fit was refused (${models.singleTrackRefusal?.reason ?? 'no reason recorded'})`;
  const speeds: LumpedAtSpeed[] = models.speeds.map((record) => ({
    speed_mps: record.speed_mps,
    gain: record.fopdt.gain,
    timeConstant_s: record.fopdt.timeConstant_s,
    deadTime_s: record.fopdt.deadTime_s,
  }));
  return checkModelFromSummary(
    { kind: 'interpolated-lumped', cgToFrontAxle_m: vehicle.cgToFrontAxle_m, speeds },
    `per-speed FOPDT models at ${speeds.length} test speeds, interpolated linearly in speed and held beyond the end speeds: ${reason}`,
  );
}

const SINGLE_TRACK_FIELDS = [
  'mass_kg',
  'yawInertia_kgm2',
  'cgToFrontAxle_m',
  'cgToRearAxle_m',
  'frontCorneringStiffness_NPerRad',
  'rearCorneringStiffness_NPerRad',
  'actuatorLag_s',
  'actuatorDelay_s',
  'understeerGradient_radPerMps2',
] as const;

const isFiniteNumber = (value: unknown): value is number => typeof value === 'number' && Number.isFinite(value);

/**
 * A schedule's `provenance.model` as a check model summary, or null when it is not one speedband
 * can rebuild (another kind, or a number missing): the caller then asks for a models file or logs.
 */
export function parseCheckModelSummary(value: unknown): CheckModelSummary | null {
  if (typeof value !== 'object' || value === null) return null;
  const record = value as Record<string, unknown>;
  if (record.kind === 'single-track') {
    return SINGLE_TRACK_FIELDS.every((field) => isFiniteNumber(record[field])) ? (record as unknown as CheckModelSummary) : null;
  }
  if (record.kind === 'interpolated-lumped' && isFiniteNumber(record.cgToFrontAxle_m) && Array.isArray(record.speeds) && record.speeds.length > 0) {
    const speedsValid = (record.speeds as unknown[]).every(
      (entry) =>
        typeof entry === 'object' &&
        entry !== null &&
        ['speed_mps', 'gain', 'timeConstant_s', 'deadTime_s'].every((field) => isFiniteNumber((entry as Record<string, unknown>)[field])),
    );
    return speedsValid ? (record as unknown as CheckModelSummary) : null;
  }
  return null;
}
