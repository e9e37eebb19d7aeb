/**
 * The text of schedule.json: fields in the order the schema lists them (readable top-down:
 * what it is, loop, controller, table, check, provenance, checksum), free-form objects with sorted
 * keys, two-space indentation, numbers in shortest round-trip form, a final newline.
 * Deterministic: the same schedule always gives the same bytes.
 */
import { SCHEDULE_SCHEMA } from './schedule-schema.js';
import type { ScheduleFile } from './schedule-types.js';

interface SchemaNode {
  readonly properties?: Readonly<Record<string, SchemaNode>>;
  readonly items?: SchemaNode;
}

/** A copy of `value` with object keys ordered by the schema's `properties`, other keys sorted. */
export function orderBySchema(value: unknown, schema: SchemaNode | undefined): unknown {
  if (Array.isArray(value)) return value.map((item) => orderBySchema(item, schema?.items));
  if (value === null || typeof value !== 'object') return value;
  const record = value as Record<string, unknown>;
  const known = schema?.properties === undefined ? [] : Object.keys(schema.properties).filter((key) => key in record);
  const others = Object.keys(record)
    .filter((key) => !known.includes(key))
    .sort();
  const ordered: Record<string, unknown> = {};
  for (const key of [...known, ...others]) {
    if (record[key] !== undefined) ordered[key] = orderBySchema(record[key], schema?.properties?.[key]);
  }
  return ordered;
}

/** schedule.json text for a schedule. */
export function serialiseSchedule(schedule: ScheduleFile): string {
  return `${JSON.stringify(orderBySchema(schedule, SCHEDULE_SCHEMA as SchemaNode), null, 2)}\n`;
}
