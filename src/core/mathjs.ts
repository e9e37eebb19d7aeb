/**
 * mathjs, loaded on first use only. Importing it costs 0.3–0.5 s (≈ 0.15 s from the CLI bundle's
 * separate chunk, scripts/bundle-cli.mjs), so no module imports it at the top level: `--help` and a
 * build with plain numbers and the default log units never pay for it. The paths that do: a log unit
 * outside the built-in table (src/core/unit-expressions.ts) and a plan value given as an expression of
 * speed (src/core/speed-expression.ts).
 *
 * A private instance (`create(all)`), so nothing the program or a library caller does to the shared
 * default instance changes unit definitions or functions here.
 */
import type { MathJsInstance } from 'mathjs';

let loading: Promise<MathJsInstance> | undefined;

/** The program's mathjs instance, imported and created on the first call. */
export function loadMathjs(): Promise<MathJsInstance> {
  loading ??= import('mathjs').then(({ create, all }) => create(all, {}));
  return loading;
}
