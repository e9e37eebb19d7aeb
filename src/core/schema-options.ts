/**
 * Ajv settings of the program, shared by run-time compilation (schema.ts) and the precompiled
 * validators (validator-code.ts). `validateSchema: false`: our schemas are constants of the program,
 * so checking them against the JSON Schema meta-schema at every start (compiling the meta-schema
 * costs ≈ 60 ms) is done once in the tests instead (test/core/schema.test.ts); strict mode still
 * refuses unknown keywords while compiling.
 */
export const AJV_OPTIONS = { allErrors: true, strict: true, allowUnionTypes: true, validateSchema: false } as const;
