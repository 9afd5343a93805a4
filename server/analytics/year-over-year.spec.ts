import { describe, expect, it } from 'vitest';
import { medianOfCounts } from './year-over-year';

/** The median as a textbook computes it from the values themselves. */
function plainMedian(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

describe('medianOfCounts', () => {
  it('should answer the plain median of the values the counts stand for', () => {
    const cases: [number, number][][] = [
      [[3, 1]],
      [
        [0, 2],
        [1, 2],
      ],
      [
        [0, 1],
        [2, 5],
        [4, 1],
      ],
      [
        [1, 3],
        [2, 3],
        [5, 1],
        [7, 1],
      ],
    ];
    for (const counts of cases) {
      const values = counts.flatMap(([value, count]) => Array<number>(count).fill(value));
      expect(medianOfCounts(counts)).toBe(plainMedian(values));
    }
  });

  it('should answer 0 when there is nobody to count', () => {
    expect(medianOfCounts([])).toBe(0);
  });
});
