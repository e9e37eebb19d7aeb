/**
 * The schedule checksum: SHA-256 over the canonical JSON (RFC 8785, canonical-json.ts) of the whole
 * schedule file except its own `checksum` field — status, vehicle, loop, controller (latency
 * included), interpolation, units, breakpoints with their margins, the check (range, thresholds,
 * results), provenance, cautions, and any field a later version adds, with no list to keep up to date.
 * The value covered is the file's JSON (numbers as JSON writes them), so the same bytes are hashed
 * whether the schedule was just assembled or read back.
 * Section digests (one per top-level field, or per child of a top-level object or array: each
 * breakpoint, each controller setting …) let a mismatch name what changed. They are not a
 * signature: anyone can recompute them, which is why `export` re-runs the dense check.
 */
import { sha256Hex } from '../core/files.js';
import { jsonPointer } from '../core/json-text.js';
import { canonicalJson } from './canonical-json.js';
import type { ScheduleChecksum, ScheduleFile } from './schedule-types.js';

export const CANONICAL_FORM_TEXT =
  'SHA-256 of RFC 8785 canonical JSON (keys sorted, no whitespace, shortest round-trip numbers) of the whole schedule file ' +
  'except its "checksum" field; sections: one digest per top-level field, or per child of a top-level object or array';

/** The schedule without its checksum, as the file's JSON holds it. */
function covered(schedule: object): Record<string, unknown> {
  const { checksum: _ignored, ...rest } = JSON.parse(JSON.stringify(schedule)) as Record<string, unknown>;
  return rest;
}

/** The bytes the checksum is taken over (canonical JSON text of everything but the checksum). */
export function checksumContent(schedule: object): string {
  return canonicalJson(covered(schedule));
}

function sectionDigests(content: Readonly<Record<string, unknown>>): Record<string, string> {
  const sections: Record<string, string> = {};
  for (const [key, value] of Object.entries(content)) {
    const children = value !== null && typeof value === 'object' ? Object.entries(value as Record<string, unknown>) : [];
    if (children.length === 0) {
      sections[jsonPointer([key])] = sha256Hex(canonicalJson(value));
    } else {
      for (const [child, childValue] of children)
        sections[jsonPointer([key, Array.isArray(value) ? Number(child) : child])] = sha256Hex(canonicalJson(childValue));
    }
  }
  return sections;
}

/** Compute the checksum record of a schedule (any `checksum` field it has is ignored). */
export function computeScheduleChecksum(schedule: Omit<ScheduleFile, 'checksum'> | ScheduleFile): ScheduleChecksum {
  const content = covered(schedule);
  return {
    algorithm: 'SHA-256',
    canonicalForm: CANONICAL_FORM_TEXT,
    value: sha256Hex(canonicalJson(content)),
    sections: sectionDigests(content),
  };
}

export interface ChecksumVerdict {
  readonly valid: boolean;
  /** What differs from the recorded checksum, in words (empty when valid). */
  readonly changes: readonly string[];
  /** The sections that differ, as JSON pointers (empty when valid, or when only the checksum itself was altered). */
  readonly sections: readonly string[];
}

/** A section's name in words: a breakpoint by number and speed, anything else by its JSON pointer. */
function sectionName(pointer: string, schedule: ScheduleFile): string {
  const breakpoint = /^\/breakpoints\/(\d+)$/.exec(pointer);
  if (breakpoint === null) return pointer;
  const row = schedule.breakpoints[Number(breakpoint[1])] as { speed_mps?: unknown } | undefined;
  return `breakpoint ${breakpoint[1]}${row !== undefined && typeof row.speed_mps === 'number' ? ` (speed ${row.speed_mps} m/s)` : ''}`;
}

/** Recompute the checksum of a schedule and compare with the one it carries; name the sections that changed. */
export function verifyScheduleChecksum(schedule: ScheduleFile): ChecksumVerdict {
  const expected = schedule.checksum;
  const actual = computeScheduleChecksum(schedule);
  if (actual.value === expected.value) return { valid: true, changes: [], sections: [] };
  const recorded = expected.sections ?? {};
  const changes: string[] = [];
  const sections: string[] = [];
  for (const [pointer, digest] of Object.entries(actual.sections)) {
    if (Object.hasOwn(recorded, pointer) && recorded[pointer] === digest) continue;
    changes.push(Object.hasOwn(recorded, pointer) ? sectionName(pointer, schedule) : `${sectionName(pointer, schedule)} (added)`);
    sections.push(pointer);
  }
  for (const pointer of Object.keys(recorded)) {
    if (Object.hasOwn(actual.sections, pointer)) continue;
    changes.push(`${pointer} (removed)`);
    sections.push(pointer);
  }
  if (changes.length === 0) changes.push('the checksum value or its section digests (every section matches its digest)');
  return { valid: false, changes, sections };
}
