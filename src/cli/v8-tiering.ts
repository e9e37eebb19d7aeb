/**
 * How soon V8 hands a function to its optimising compiler: after 1,000,000 units of bytecode budget instead of
 * V8's default 67,584 (Node 20). A build runs a few hundred functions long enough to be optimised; with the default
 * budget many of them are optimised early, then deoptimised and compiled again as they meet new shapes of input, and
 * compiling takes about a fifth of a short build's time. With the larger budget only the truly hot functions
 * (simulation and frequency-sweep loops, which reach it within milliseconds) are compiled, once their feedback has
 * settled. The flag changes when code is optimised, never what it computes: every tier of V8 runs the same
 * IEEE 754 arithmetic, and the demo schedules are the same bytes with and without it.
 *
 * Measured on one core: `demo` 2.45 s → 1.90 s, a heading build 2.6 s → 2.1 s, a heading build with a variation set
 * 12.3–14.6 s → 11.0–11.3 s. On two cores the compiler's thread runs beside the build, so a build's wall time is about
 * the same (1.6–2.1 s either way) while its CPU time falls (2.7–2.8 → 2.2–2.7 core-s). A loop repeated for long in one
 * process reaches full speed later (a dense check of 2,000 speeds, run five times in one process: 650–720 ms → 850–970 ms
 * from the second run on), so the library itself leaves V8 as it is: only the CLI, a short process, sets this, and the
 * test suite for its workers (vitest.config.ts).
 */
export const INTERRUPT_BUDGET_FLAG = '--interrupt-budget=1000000';
