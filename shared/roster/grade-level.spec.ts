import { describe, expect, it } from 'vitest';
import { formatGradeLevel, parseGradeLevel } from './grade-level';

describe('parseGradeLevel', () => {
  // CEDS entry-grade codes (used by OneRoster 1.1): KG, 01 to 12.
  it.each([
    ['K', 0],
    ['k', 0],
    ['KG', 0],
    ['kg', 0],
    ['Kindergarten', 0],
    ['Grade K', 0],
    ['01', 1],
    ['5', 5],
    ['05', 5],
    ['5th', 5],
    ['1st', 1],
    ['2nd', 2],
    ['3rd', 3],
    ['Grade 5', 5],
    ['grade 12', 12],
    ['Gr. 8', 8],
    ['Gr 8', 8],
    ['6th Grade', 6],
    [' 12 ', 12],
    ['0', 0],
  ])('should read %j as grade %i when it names a grade from K to 12', (cell, grade) => {
    expect(parseGradeLevel(cell)).toBe(grade);
  });

  it.each(['13', 'Grade 13', 'PK', 'TK', '-1', '5.5', '', 'fifth', '100', 'K5'])(
    'should give null for %j when it names no grade from K to 12',
    (cell) => {
      expect(parseGradeLevel(cell)).toBeNull();
    },
  );

  it('should take whole numbers 0 to 12 and refuse other numbers when the grade is a number', () => {
    expect(parseGradeLevel(0)).toBe(0);
    expect(parseGradeLevel(12)).toBe(12);
    expect(parseGradeLevel(13)).toBeNull();
    expect(parseGradeLevel(4.5)).toBeNull();
    expect(parseGradeLevel(-1)).toBeNull();
  });
});

describe('formatGradeLevel', () => {
  it('should write K for kindergarten and the number otherwise when writing a roster', () => {
    expect(formatGradeLevel(0)).toBe('K');
    expect(formatGradeLevel(7)).toBe('7');
    expect(formatGradeLevel(12)).toBe('12');
  });
});
