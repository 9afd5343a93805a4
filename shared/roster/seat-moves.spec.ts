import { describe, expect, it } from 'vitest';
import { describeSeatMoves } from './seat-moves';

describe('describeSeatMoves', () => {
  it('should name the seat left before the one joined when a student moves', () => {
    expect(
      describeSeatMoves([
        { field: 'ensemble', before: null, after: 'Concert Band' },
        { field: 'ensemble', before: 'Sixth Grade Band', after: null },
      ]),
    ).toBe('Leaves Sixth Grade Band, joins Concert Band');
  });

  it('should list several ensembles with "and" when a student joins more than one', () => {
    expect(
      describeSeatMoves([
        { field: 'ensemble', before: null, after: 'Jazz Band' },
        { field: 'ensemble', before: null, after: 'Concert Band' },
        { field: 'grade', before: '6', after: '7' },
      ]),
    ).toBe('Joins Jazz Band and Concert Band');
  });

  it('should answer null when no change is about an ensemble seat', () => {
    expect(describeSeatMoves([{ field: 'grade', before: '6', after: '7' }])).toBeNull();
  });
});
