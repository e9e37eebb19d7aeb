/**
 * Reading a vehicle file: a path to vehicle.json, or a folder holding one.
 * Checked in three passes, each error naming the file and the JSON path:
 * required fields (with a hint when the field is present under another unit),
 * unknown fields (with "did you mean"), the JSON Schema (types), then physical
 * ranges and relations.
 */
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { SpeedbandError } from '../core/errors.js';
import { readTextFile } from '../core/files.js';
import { validateVehicleFile } from '../core/precompiled-validators.js';
import { makeValidator, parseJsonText } from '../core/schema.js';
import { closestName } from '../core/closest-name.js';
import { VEHICLE_RANGES, VEHICLE_SCHEMA } from './schema.js';
import { bundledVehicleFolder, bundledVehicles, shownPath } from './bundled.js';
import type { Vehicle } from './types.js';
import { QUOTED_TEXT_MAX, cutText, quoted } from '../core/quote.js';

/** The file name looked for when a folder is given. */
export const VEHICLE_FILE_NAME = 'vehicle.json';

const validateStructure = makeValidator<Vehicle>({ schema: VEHICLE_SCHEMA, code: 'vehicle.invalid', what: 'vehicle file', precompiled: validateVehicleFile });

/** The stem of a field name without its unit suffix: 'mass_kg' → 'mass'. */
const stemOf = (name: string): string => name.split('_')[0].toLowerCase();

function checkRequiredFields(value: Record<string, unknown>, file: string): void {
  const known = new Set<string>(Object.keys(VEHICLE_SCHEMA.properties));
  for (const field of VEHICLE_SCHEMA.required) {
    if (field in value) continue;
    const lookalike = Object.keys(value).find((key) => !known.has(key) && stemOf(key) === stemOf(field));
    const hint =
      lookalike === undefined
        ? `add "${field}" (${VEHICLE_SCHEMA.properties[field].description})`
        : `found ${quoted(lookalike)} instead — rename it to "${field}" and give the value in the unit the name states`;
    throw new SpeedbandError('vehicle.missingField', `missing required field "${field}": ${hint}`, {
      location: { file, jsonPath: `/${field}` },
      details: { field, lookalike: lookalike ?? null },
    });
  }
}

function checkUnknownFields(value: Record<string, unknown>, file: string): void {
  const known = Object.keys(VEHICLE_SCHEMA.properties);
  for (const key of Object.keys(value)) {
    if (known.includes(key)) continue;
    const suggestion = closestName(key, known);
    const hint = suggestion === null ? `known fields: ${known.filter((name) => name !== '$schema').join(', ')}` : `did you mean "${suggestion}"?`;
    throw new SpeedbandError('vehicle.unknownField', `unknown field ${quoted(key)} — ${hint} (remove it or fix its spelling)`, {
      location: { file, jsonPath: `/${cutText(key, QUOTED_TEXT_MAX)}` },
      details: { field: cutText(key, QUOTED_TEXT_MAX), suggestion },
    });
  }
}

function checkRanges(vehicle: Vehicle, file: string): void {
  for (const range of VEHICLE_RANGES) {
    const value = vehicle[range.field];
    if (value === undefined) continue;
    const numeric = value as number;
    const belowMinimum = range.minimumInclusive ? numeric < range.minimum : numeric <= range.minimum;
    const aboveMaximum = range.maximum !== undefined && numeric >= range.maximum;
    if (Number.isFinite(numeric) && !belowMinimum && !aboveMaximum) continue;
    throw new SpeedbandError('vehicle.outOfRange', `${range.field} is ${numeric}, expected ${range.expected} — ${range.advice}`, {
      location: { file, jsonPath: `/${range.field}` },
      details: { field: range.field, found: numeric, minimum: range.minimum, maximum: range.maximum ?? null },
    });
  }
  const hasFront = vehicle.frontCorneringStiffness_NPerRad !== undefined;
  const hasRear = vehicle.rearCorneringStiffness_NPerRad !== undefined;
  if (hasFront !== hasRear) {
    const missing = hasFront ? 'rearCorneringStiffness_NPerRad' : 'frontCorneringStiffness_NPerRad';
    throw new SpeedbandError(
      'vehicle.incompleteStiffness',
      `only one nominal cornering stiffness is given — the simulator needs both axles: add "${missing}" or remove the other`,
      { location: { file, jsonPath: `/${missing}` }, details: { missing } },
    );
  }
}

/**
 * Validate a parsed vehicle file (already-parsed JSON) and return it typed.
 * `file` is used in error locations only. Throws `SpeedbandError` with code
 * `vehicle.missingField`, `vehicle.unknownField`, `vehicle.invalid` (schema), `vehicle.outOfRange` or
 * `vehicle.incompleteStiffness`, located by file and JSON path.
 */
export function validateVehicle(value: unknown, file: string): Vehicle {
  if (typeof value === 'object' && value !== null && !Array.isArray(value)) {
    checkRequiredFields(value as Record<string, unknown>, file);
    checkUnknownFields(value as Record<string, unknown>, file);
  }
  const vehicle = validateStructure(value, file);
  checkRanges(vehicle, file);
  return vehicle;
}

/**
 * The vehicle.json a user's path stands for: the path itself, vehicle.json inside a folder, or — when
 * nothing exists at the path and it is a bundled demo vehicle's name (`parcel-van`) — that vehicle's file.
 */
export function resolveVehiclePath(path: string): string {
  const bundled = existsSync(path) ? undefined : bundledVehicleFolder(path);
  if (bundled !== undefined) return shownPath(join(bundled, VEHICLE_FILE_NAME));
  if (!existsSync(path) && !/[\\/.]/.test(path)) {
    throw new SpeedbandError(
      'vehicle.notFound',
      `no file or folder ${quoted(path)} here, and no bundled demo vehicle of that name (${bundledVehicles().join(', ')}) — give the path of vehicle.json or of its folder`,
      { location: { file: path }, details: { bundled: bundledVehicles() } },
    );
  }
  if (existsSync(path) && statSync(path).isDirectory()) {
    const inside = join(path, VEHICLE_FILE_NAME);
    if (!existsSync(inside)) {
      throw new SpeedbandError('vehicle.notFound', `the folder has no ${VEHICLE_FILE_NAME} — pass the vehicle file itself or a folder that contains one`, {
        location: { file: path },
      });
    }
    return inside;
  }
  return path;
}

/**
 * Read and validate a vehicle file. `path` is a vehicle.json file or a folder
 * containing vehicle.json (e.g. `vehicles/parcel-van`). SI units throughout.
 */
export function loadVehicle(path: string): Vehicle {
  const file = resolveVehiclePath(path);
  return validateVehicle(parseJsonText(readTextFile(file), file), file);
}
