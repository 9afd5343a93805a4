import { describe, expect, it } from 'vitest';
import { maxAttempts, retryDelay } from './mail-worker';

describe('retryDelay', () => {
  it('should wait longer after each failed try, from 5 seconds up to 6 hours', () => {
    const delays = Array.from({ length: maxAttempts - 1 }, (_, index) => retryDelay(index + 1));
    expect(delays).toEqual([5_000, 30_000, 120_000, 600_000, 3_600_000, 10_800_000, 21_600_000]);
  });

  it('should keep the longest wait when the tries go past the table', () => {
    expect(retryDelay(50)).toBe(21_600_000);
  });
});
