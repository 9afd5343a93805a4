import { describe, expect, it } from 'vitest';
import { guessMapping, mappingProblems, rosterColumnNames, rosterFields } from './roster-columns';

describe('guessMapping', () => {
  it('should map every field to its own column when the file has the roster columns', () => {
    const headers = rosterFields.map((field) => rosterColumnNames[field]);
    expect(guessMapping(headers)).toEqual(rosterColumnNames);
  });

  // Headers of the kind student information systems export (common practice, no source).
  it('should map the usual headers when the file is a student information system export', () => {
    const headers = [
      'Student Number',
      'Legal First Name',
      'Last Name',
      'Nickname',
      'Grade Level',
      'School',
      'Course',
      'Instrument',
      'Parent Name',
      'Parent/Guardian Email',
    ];
    expect(guessMapping(headers)).toEqual({
      studentId: 'Student Number',
      firstName: 'Legal First Name',
      lastName: 'Last Name',
      preferredName: 'Nickname',
      grade: 'Grade Level',
      schoolCode: 'School',
      ensemble: 'Course',
      instrument: 'Instrument',
      guardianName: 'Parent Name',
      guardianEmail: 'Parent/Guardian Email',
    });
  });

  it.each([
    ['STUDENT_ID', 'studentId'],
    ['student number', 'studentId'],
    ['student_number', 'studentId'],
    ['Student #', 'studentId'],
    ['Local ID', 'studentId'],
    ['ID', 'studentId'],
    ['FIRST NAME', 'firstName'],
    ['Surname', 'lastName'],
    ['Preferred Name', 'preferredName'],
    ['grade-level', 'grade'],
    ['School Code', 'schoolCode'],
    ['Building', 'schoolCode'],
    ['Class', 'ensemble'],
    ['Ensemble', 'ensemble'],
    ['Guardian', 'guardianName'],
    ['Guardian Name', 'guardianName'],
    ['Guardian E-mail', 'guardianEmail'],
    ['Parent Email', 'guardianEmail'],
  ])('should map %j to %s when case, spaces and punctuation differ', (header, field) => {
    expect(guessMapping([header])).toEqual({ [field]: header });
  });

  it('should prefer the more specific header when two headers could feed one field', () => {
    expect(guessMapping(['ID', 'School', 'Student ID', 'School Code'])).toEqual({
      studentId: 'Student ID',
      schoolCode: 'School Code',
    });
  });

  it('should let a roster column name win over a synonym when both are present', () => {
    expect(guessMapping(['Class', 'ensemble'])).toEqual({ ensemble: 'ensemble' });
  });

  it('should leave headers it does not know unmapped when nothing matches', () => {
    expect(guessMapping(['Home Address', 'Bus Route', ''])).toEqual({});
  });
});

describe('mappingProblems', () => {
  it('should name each required field with no column when the mapping lacks them', () => {
    expect(mappingProblems({ studentId: 'ID', firstName: 'First' })).toEqual([
      {
        field: 'lastName',
        message:
          'The file has no Last name column (last_name); add one or choose the column that holds it.',
      },
      {
        field: 'grade',
        message:
          'The file has no Grade column (grade); add one or choose the column that holds it.',
      },
      {
        field: 'schoolCode',
        message:
          'The file has no School code column (school_code); add one or choose the column that holds it.',
      },
    ]);
  });

  it('should report nothing when every required field has its own column', () => {
    const mapping = { studentId: 'a', firstName: 'b', lastName: 'c', grade: 'd', schoolCode: 'e' };
    expect(mappingProblems(mapping, ['a', 'b', 'c', 'd', 'e'])).toEqual([]);
  });

  it('should report a header chosen twice and a header the file lacks when the mapping has them', () => {
    const mapping = {
      studentId: 'a',
      firstName: 'b',
      lastName: 'b',
      grade: 'd',
      schoolCode: 'Building',
    };
    expect(mappingProblems(mapping, ['a', 'b', 'd'])).toEqual([
      { field: 'lastName', message: "Column 'b' is chosen for both First name and Last name." },
      { field: 'schoolCode', message: "The file has no column 'Building' for School code." },
    ]);
  });
});
