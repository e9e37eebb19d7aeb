import { SpeedbandError } from '../core/errors.js';
import { readTextFile, writeFileAtomic, type WriteOptions, type WriteOutcome } from '../core/files.js';
import { validateModelsFile } from '../core/precompiled-validators.js';
import { makeValidator, parseJsonText } from '../core/schema.js';
import { MODELS_FORMAT, MODELS_FORMAT_VERSION, MODELS_SCHEMA, type ModelsFile } from './models-schema.js';
import { QUOTED_TEXT_MAX, cutText } from '../core/quote.js';

const validateModels = makeValidator<ModelsFile>({
  schema: MODELS_SCHEMA,
  code: 'models.invalid',
  what: 'speedband models file',
  precompiled: validateModelsFile,
});

/** The models file as text: validated, 2-space JSON with a final newline (same models → same bytes). */
export function modelsToJson(models: ModelsFile, file = 'models.json'): string {
  validateModels(JSON.parse(JSON.stringify(models)), file);
  return `${JSON.stringify(models, null, 2)}\n`;
}

/** Parse and validate models-file text; `file` names it in errors. */
export function parseModels(text: string, file: string): ModelsFile {
  const value = parseJsonText(text, file);
  if (typeof value === 'object' && value !== null && (value as { format?: unknown }).format !== MODELS_FORMAT) {
    throw new SpeedbandError(
      'models.wrongFormat',
      `not a speedband models file: format is ${cutText(String(JSON.stringify((value as { format?: unknown }).format)), QUOTED_TEXT_MAX)}, expected "${MODELS_FORMAT}" — give the file written by speedband identify`,
      { location: { file, jsonPath: '/format' } },
    );
  }
  if (typeof value === 'object' && value !== null && (value as { formatVersion?: unknown }).formatVersion !== MODELS_FORMAT_VERSION) {
    throw new SpeedbandError(
      'models.unsupportedVersion',
      `models file format version ${cutText(String(JSON.stringify((value as { formatVersion?: unknown }).formatVersion)), QUOTED_TEXT_MAX)} is not supported (this speedband reads version ${MODELS_FORMAT_VERSION}) — rerun speedband identify`,
      { location: { file, jsonPath: '/formatVersion' } },
    );
  }
  return validateModels(value, file);
}

/** Read and validate a models file (JSON Schema in models-schema.ts). */
export function readModels(path: string): ModelsFile {
  return parseModels(readTextFile(path), path);
}

/** Validate and write a models file atomically; a different existing file is replaced only with `options.force`. */
export function writeModels(path: string, models: ModelsFile, options: WriteOptions): WriteOutcome {
  return writeFileAtomic(path, modelsToJson(models, path), options);
}
