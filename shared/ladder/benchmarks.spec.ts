import { describe, expect, it } from 'vitest';
import { benchmarksInForce } from './index';

const benchmarks = [
  { grade: 6, rung: 1, byDate: '2027-01-31' },
  { grade: 6, rung: 2, byDate: '2027-05-31' },
  { grade: 7, rung: 3, byDate: '2027-05-31' },
];

describe('benchmarksInForce', () => {
  it('should take the first benchmark when the day is before every benchmark date', () => {
    expect(benchmarksInForce(benchmarks, '2026-12-01').get(6)).toEqual(benchmarks[0]);
  });

  it('should take the latest benchmark whose date has come', () => {
    expect(benchmarksInForce(benchmarks, '2027-01-31').get(6)?.rung).toBe(1);
    expect(benchmarksInForce(benchmarks, '2027-06-01').get(6)?.rung).toBe(2);
    expect(benchmarksInForce([...benchmarks].reverse(), '2027-03-01').get(6)?.rung).toBe(1);
  });

  it('should leave out grades that have no benchmark', () => {
    const inForce = benchmarksInForce(benchmarks, '2026-12-01');
    expect([...inForce.keys()].sort()).toEqual([6, 7]);
    expect(inForce.get(7)?.rung).toBe(3);
  });
});
