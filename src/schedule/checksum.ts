/**
 * The schedule checksum: SHA-256 over the canonical JSON (RFC 8785, canonical-json.ts) of exactly
 * what changes the numbers firmware computes:
 *   { format, formatVersion,
 *     loop: { kind, preview_m?, referencePoint? },
 *     controller: { form, derivativeFilter, discretisation, sampleTime_s, integratorClamp_rad },
 *     interpolation: { method, outOfRange, lowSpeedFloor_mps },
 *     breakpoints: [{ speed_mps, kp, ki, kd }, …] }
 * Per-section digests (same canonical form, one per part and one per breakpoint) let a mismatch
 * name what changed. Margins, provenance and texts are not covered (they do not change the output).
 */
import { sha256Hex } from '../core/files.js';
import { canonicalJson } from './canonical-json.js';
import type { ScheduleChecksum, ScheduleFile } from './schedule-types.js';

export const CANONICAL_FORM_TEXT =
  'SHA-256 of RFC 8785 canonical JSON (keys sorted, no whitespace, shortest round-trip numbers) of ' +
  '{format, formatVersion, loop {kind, preview_m, referencePoint}, controller {form, derivativeFilter, discretisation, ' +
  'sampleTime_s, integratorClamp_rad}, interpolation {method, outOfRange, lowSpeedFloor_mps}, breakpoints [{speed_mps, kp, ki, kd}]}';

type ChecksumInput = Pick<ScheduleFile, 'format' | 'formatVersion' | 'loop' | 'controller' | 'interpolation' | 'breakpoints'>;

function parts(schedule: ChecksumInput) {
  const { loop, controller, interpolation } = schedule;
  return {
    loop: { kind: loop.kind, preview_m: loop.preview_m, referencePoint: loop.referencePoint },
    controller: {
      form: controller.form,
      derivativeFilter: controller.derivativeFilter,
      discretisation: controller.discretisation,
      sampleTime_s: controller.sampleTime_s,
      integratorClamp_rad: controller.integratorClamp_rad,
    },
    interpolation: { method: interpolation.method, outOfRange: interpolation.outOfRange, lowSpeedFloor_mps: interpolation.lowSpeedFloor_mps },
    breakpoints: schedule.breakpoints.map(({ speed_mps, kp, ki, kd }) => ({ speed_mps, kp, ki, kd })),
  };
}

/** The bytes the checksum is taken over (canonical JSON text). */
export function checksumContent(schedule: ChecksumInput): string {
  return canonicalJson({ format: schedule.format, formatVersion: schedule.formatVersion, ...parts(schedule) });
}

/** Compute the checksum record of a schedule (value and section digests). */
export function computeScheduleChecksum(schedule: ChecksumInput): ScheduleChecksum {
  const p = parts(schedule);
  return {
    algorithm: 'SHA-256',
    canonicalForm: CANONICAL_FORM_TEXT,
    value: sha256Hex(checksumContent(schedule)),
    sections: {
      loop: sha256Hex(canonicalJson(p.loop)),
      controller: sha256Hex(canonicalJson(p.controller)),
      interpolation: sha256Hex(canonicalJson(p.interpolation)),
      breakpoints: p.breakpoints.map((row) => sha256Hex(canonicalJson(row))),
    },
  };
}

export interface ChecksumVerdict {
  readonly valid: boolean;
  /** What differs from the recorded checksum, in words (empty when valid). */
  readonly changes: readonly string[];
}

/** Recompute the checksum of a schedule and compare with the one it carries; name the parts that changed. */
export function verifyScheduleChecksum(schedule: ScheduleFile): ChecksumVerdict {
  const expected = schedule.checksum;
  const actual = computeScheduleChecksum(schedule);
  if (actual.value === expected.value) return { valid: true, changes: [] };
  const changes: string[] = [];
  for (const part of ['loop', 'controller', 'interpolation'] as const) {
    if (actual.sections[part] !== expected.sections[part]) changes.push(`the ${part} settings`);
  }
  const recorded = expected.sections.breakpoints;
  if (recorded.length !== actual.sections.breakpoints.length) {
    changes.push(`the number of breakpoints (${recorded.length} when written, ${actual.sections.breakpoints.length} now)`);
  } else {
    actual.sections.breakpoints.forEach((digest, k) => {
      if (digest !== recorded[k]) changes.push(`breakpoint ${k} (speed ${schedule.breakpoints[k].speed_mps} m/s: speed or gains)`);
    });
  }
  if (changes.length === 0) changes.push('the checksum value or its section digests (the table itself matches the section digests)');
  return { valid: false, changes };
}
