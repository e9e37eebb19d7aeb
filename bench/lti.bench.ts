import { makeRandom } from '../src/core/random.js';
import { frequencyResponse, logarithmicFrequencies } from '../src/lti/frequency-response.js';
import { padeOrderFor } from '../src/lti/pade.js';
import { multiplyPolynomials } from '../src/lti/polynomial.js';
import { polynomialRoots } from '../src/lti/roots.js';
import { stepResponse } from '../src/lti/time-response.js';
import { transferFunction } from '../src/lti/transfer-function.js';
import { printFigure } from './measure.js';

/** Best of a few rounds of `repeat` calls: work units per second. */
function rate(work: () => unknown, repeat: number, unitsPerCall: number): number {
  let best = Infinity;
  for (let round = 0; round < 5; round++) {
    const start = process.hrtime.bigint();
    for (let i = 0; i < repeat; i++) work();
    best = Math.min(best, Number(process.hrtime.bigint() - start) / 1e9);
  }
  return (repeat * unitsPerCall) / best;
}

// A 6th-order loop with delay: PID (2nd order) × actuator lag × single-track yaw model × sensor lag.
const loop = transferFunction(
  multiplyPolynomials([0.9, 3.2, 1.1], [1, 6]),
  multiplyPolynomials(multiplyPolynomials([0.002, 0.1, 0], [0.08, 1]), multiplyPolynomials([1, 8.4, 30.5], [0.02, 1])),
  0.06,
);
const grid = logarithmicFrequencies(1e-2, 1e3, 2000);
const frequencyRate = rate(() => frequencyResponse(loop, grid), 200, grid.length);
printFigure('frequency response, 6th-order loop with delay, 2,000 points', frequencyRate / 1e6, 'M points/s');
printFigure('  one 2,000-point sweep', (1e3 * grid.length) / frequencyRate, 'ms');

const random = makeRandom(8);
const polynomials = Array.from({ length: 200 }, () => [1, ...Array.from({ length: 8 }, () => 0.1 + 10 * random.uniform())]);
let next = 0;
const rootsRate = rate(() => polynomialRoots(polynomials[next++ % polynomials.length]), 2000, 1);
printFigure('roots of a degree-8 polynomial', rootsRate, 'per s');

const time = Float64Array.from({ length: 10_000 }, (_, k) => k * 0.001);
const plant = transferFunction([1.1, 6.6], multiplyPolynomials([1, 8.4, 30.5], [0.08, 1]), 0.0425);
const stepRate = rate(() => stepResponse(plant, time), 5, time.length);
printFigure('step response, 3rd order, fractional-sample delay', stepRate / 1e6, 'M samples/s');

padeOrderFor(0.1, 1); // fill the per-order table once, as any long run would
let band = 0;
const padeRate = rate(() => padeOrderFor(0.1, 10 + (band++ % 150)), 2000, 1);
printFigure('padeOrderFor, ω·θ from 1 to 16', padeRate, 'per s');
