/**
 * Writes src/core/precompiled-validators.ts: Ajv standalone validators of the files speedband reads
 * and writes, so that no schema is compiled at run time. Run after changing a schema:
 * `npm run precompile-validators` (test/core/precompiled-validators.test.ts fails until then).
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { precompiledValidatorSource } from '../src/core/validator-code.js';
import { MODELS_SCHEMA } from '../src/identify/models-schema.js';
import { LOG_PROFILE_SCHEMA } from '../src/log/profile.js';
import { PLAN_SCHEMA } from '../src/schedule/plan-schema.js';
import { SCHEDULE_SCHEMA } from '../src/schedule/schedule-schema.js';
import { VEHICLE_SCHEMA } from '../src/vehicle/schema.js';

/** Export name in the generated module → schema. */
export const PRECOMPILED_SCHEMAS: Readonly<Record<string, object>> = {
  validateLogProfile: LOG_PROFILE_SCHEMA,
  validateModelsFile: MODELS_SCHEMA,
  validatePlanFile: PLAN_SCHEMA,
  validateScheduleFile: SCHEDULE_SCHEMA,
  validateVehicleFile: VEHICLE_SCHEMA,
};

export const PRECOMPILED_PATH = fileURLToPath(new URL('../src/core/precompiled-validators.ts', import.meta.url));

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  writeFileSync(PRECOMPILED_PATH, precompiledValidatorSource(PRECOMPILED_SCHEMAS));
  process.stdout.write(`wrote ${PRECOMPILED_PATH}\n`);
}
