/**
 * Every property test runs from one fixed seed, so a run of the suite is reproducible (a failure found on one
 * machine is found on every machine). Change the seed deliberately to explore other cases.
 */
import fc from 'fast-check';

fc.configureGlobal({ seed: 20261205 });
