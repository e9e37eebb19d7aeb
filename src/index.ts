/**
 * speedband's public API. This file only re-exports; see DEVELOPERS.md for the map.
 */
export { SpeedbandError, isSpeedbandError, describeError, type ErrorLocation } from './core/errors.js';
export { VERSION } from './version.js';
export { runCli } from './cli/main.js';
