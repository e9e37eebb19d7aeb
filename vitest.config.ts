import { availableParallelism } from 'node:os';
import { defineConfig } from 'vitest/config';
import { INTERRUPT_BUDGET_FLAG } from './src/cli/v8-tiering.js';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    // Test files share their workers' module cache: the stages are pure functions over plain data, and loading
    // the modules once per worker instead of once per file saves about a third of the suite's time on 2 cores.
    isolate: false,
    // One test file per core: vitest's default in a run is one fewer than the cores, on a two-core machine a single
    // worker, with the second core idle.
    maxWorkers: availableParallelism(),
    // A young generation of up to 64 MB (node's default is 16): the suite's simulations allocate fast, and with the
    // default most of the workers' garbage-collection time went to about 3,000 young-generation collections that copy
    // what is still alive each time. Measured with --trace-gc over a whole run: 13.9 s of such pauses fell to 9.2 s
    // (1,065 collections), and the suite's user CPU time by about a tenth (two interleaved pairs: 141 s → 129 s).
    //
    // V8's optimising compiler waits for the truly hot functions, as in the CLI (src/cli/v8-tiering.ts): in a worker
    // that runs seventy test files, functions met with ever new shapes of input were optimised, deoptimised and compiled
    // again — 1,074 compilations in five of the test folders, 473 with the flag; their CPU time, on one core, 19.2 s → 16.9 s
    // (medians of four interleaved runs).
    execArgv: ['--max-semi-space-size=64', INTERRUPT_BUDGET_FLAG],
    // Transformed modules kept on disk between runs (node_modules/.experimental-vitest-cache), keyed by each file's
    // content and the configuration: a run transforms only the files changed since the last.
    experimental: { fsModuleCache: true },
    // Property tests from one fixed seed: reproducible runs (test/helpers/fast-check-seed.ts).
    setupFiles: ['test/helpers/fast-check-seed.ts'],
    // A folder for the demo builds that test files share (test/helpers/demo-builds.ts), made once per run.
    globalSetup: ['test/helpers/global-setup.ts'],
  },
});
