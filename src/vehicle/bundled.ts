/**
 * The demo vehicles shipped with speedband (vehicles/<name>/ with vehicle.json and logs/): invented,
 * for demonstration only. A command given `--vehicle parcel-van` where no such file or folder exists
 * takes the bundled one, from any working folder.
 */
import { existsSync, readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The bundled vehicles folder (…/vehicles beside src/ or dist/; the CLI bundle sits in dist/cli/). */
export const BUNDLED_VEHICLES = fileURLToPath(new URL('../../vehicles/', import.meta.url));

/** Names of the bundled demo vehicles (folders with a vehicle.json), sorted. */
export function bundledVehicles(): string[] {
  return readdirSync(BUNDLED_VEHICLES, { withFileTypes: true })
    .filter((entry) => entry.isDirectory() && existsSync(join(BUNDLED_VEHICLES, entry.name, 'vehicle.json')))
    .map((entry) => entry.name)
    .sort();
}

/** The folder of a bundled vehicle when `name` is one (a plain name, not a path), else undefined. */
export function bundledVehicleFolder(name: string): string | undefined {
  if (name === '' || name.includes('/') || name.includes('\\') || name.startsWith('.')) return undefined;
  return bundledVehicles().includes(name) ? join(BUNDLED_VEHICLES, name) : undefined;
}

/** A path as short as it can be written from the working folder: relative when inside it, else absolute. */
export function shownPath(path: string): string {
  const shown = relative(process.cwd(), path);
  return shown === '' ? '.' : shown.startsWith('..') ? path : shown;
}
