import { describe, expect, it } from 'vitest';
import { addYears, straightLineValue, wholeMonthsBetween } from './replacement-plan';

describe('wholeMonthsBetween', () => {
  it('should count a month only once its day of the month is reached', () => {
    expect(wholeMonthsBetween('2020-01-31', '2020-02-29')).toBe(0);
    expect(wholeMonthsBetween('2020-01-15', '2020-02-15')).toBe(1);
    expect(wholeMonthsBetween('2016-09-01', '2026-09-01')).toBe(120);
  });

  it('should answer 0 when the second date is earlier', () => {
    expect(wholeMonthsBetween('2026-09-01', '2025-01-01')).toBe(0);
  });
});

describe('addYears', () => {
  it('should move 29 February to 28 February in a common year', () => {
    expect(addYears('2024-02-29', 1)).toBe('2025-02-28');
    expect(addYears('2024-02-29', 4)).toBe('2028-02-29');
  });
});

describe('straightLineValue', () => {
  it('should fall evenly to nothing and never below', () => {
    expect(straightLineValue(120000, 60, 10)).toBe(60000);
    expect(straightLineValue(120000, 0, 10)).toBe(120000);
    expect(straightLineValue(120000, 200, 10)).toBe(0);
  });
});
