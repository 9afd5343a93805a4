import { describe, expect, it } from 'vitest';
import { parseDollars, parseFleetDate } from './fleet-import';

describe('parseDollars', () => {
  it('should read plain and formatted dollar amounts as cents', () => {
    expect(parseDollars('1450')).toBe(145000);
    expect(parseDollars('$5,150.50')).toBe(515050);
    expect(parseDollars('0.1')).toBe(10);
  });

  it('should refuse what is not an amount', () => {
    expect(parseDollars('cheap')).toBeUndefined();
    expect(parseDollars('-5')).toBeUndefined();
    expect(parseDollars('1.234')).toBeUndefined();
  });
});

describe('parseFleetDate', () => {
  it('should read ISO and US month/day/year dates', () => {
    expect(parseFleetDate('2019-08-01')).toBe('2019-08-01');
    expect(parseFleetDate('8/1/2019')).toBe('2019-08-01');
  });

  it('should refuse days that do not exist', () => {
    expect(parseFleetDate('2020-13-01')).toBeUndefined();
    expect(parseFleetDate('2023-02-29')).toBeUndefined();
    expect(parseFleetDate('yesterday')).toBeUndefined();
  });
});
