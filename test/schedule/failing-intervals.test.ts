import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { failingIntervals, failingIntervalWords } from '../../src/schedule/failing-intervals.js';
import type { CheckCriterion, CheckFailure } from '../../src/schedule/types.js';

const CRITERIA: CheckCriterion[] = ['stability', 'lowerGainMargin', 'upperGainMargin', 'phaseMargin', 'delayMargin', 'sensitivityPeak'];
const failure = (criterion: CheckCriterion): CheckFailure => ({ criterion, value: null, limit: null, message: criterion });

describe('failingIntervals: where a dense check fails, as runs of consecutive grid speeds', () => {
  it('property: the runs cover exactly the failing speeds, each run is bounded by passing speeds (or the grid ends), and names every limit broken in it', () => {
    fc.assert(
      fc.property(fc.array(fc.subarray(CRITERIA), { minLength: 1, maxLength: 60 }), (perPoint) => {
        const points = perPoint.map((criteria, k) => ({ speed_mps: 1 + 0.5 * k, failures: criteria.map(failure) }));
        const intervals = failingIntervals(points);
        const failing = points.filter((point) => point.failures.length > 0);
        expect(intervals.reduce((sum, interval) => sum + interval.speeds, 0)).toBe(failing.length);
        for (const interval of intervals) {
          const first = points.findIndex((point) => point.speed_mps === interval.from_mps);
          const last = points.findIndex((point) => point.speed_mps === interval.to_mps);
          const run = points.slice(first, last + 1);
          expect(run.length).toBe(interval.speeds);
          expect(run.every((point) => point.failures.length > 0)).toBe(true);
          expect(first === 0 || points[first - 1].failures.length === 0).toBe(true);
          expect(last === points.length - 1 || points[last + 1].failures.length === 0).toBe(true);
          expect([...interval.criteria].sort()).toEqual([...new Set(run.flatMap((point) => point.failures.map((f) => f.criterion)))].sort());
        }
      }),
    );
  });

  it('says a run in words, one speed or a range, with the limits in a fixed order', () => {
    const points = [
      { speed_mps: 19.8, failures: [failure('sensitivityPeak'), failure('phaseMargin')] },
      { speed_mps: 25.0019, failures: [failure('phaseMargin')] },
      { speed_mps: 26, failures: [] },
      { speed_mps: 27, failures: [failure('stability')] },
    ];
    expect(failingIntervals(points).map(failingIntervalWords)).toEqual(['19.8–25 m/s (phase margin, peak sensitivity)', '27 m/s (closed-loop stability)']);
  });
});
