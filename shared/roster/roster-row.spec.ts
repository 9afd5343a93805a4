import { describe, expect, it } from 'vitest';
import { rosterRowSchema, type RosterRowInput } from './roster-row';

const valid: RosterRowInput = {
  studentId: 'HP-1001',
  firstName: 'Amara',
  lastName: 'Okonkwo-Reyes',
  grade: '6',
  schoolCode: 'HPMS',
};

function messages(input: RosterRowInput): { path: PropertyKey[]; message: string }[] {
  const result = rosterRowSchema.safeParse(input);
  if (result.success) return [];
  return result.error.issues.map(({ path, message }) => ({ path, message }));
}

describe('rosterRowSchema', () => {
  it('should normalise every field when the cells are messy but valid', () => {
    const row = rosterRowSchema.parse({
      studentId: ' HP-1001 ',
      firstName: '  Amara  ',
      lastName: 'Okonkwo\n  Reyes',
      preferredName: '',
      grade: 'Grade 06',
      schoolCode: 'hpms',
      ensemble: 'Concert   Band',
      instrument: 'French Horn',
      guardianName: ' Ngozi Okonkwo ',
      guardianEmail: 'ngozi.okonkwo@merrowbasin.example',
    });
    expect(row).toStrictEqual({
      studentId: 'HP-1001',
      firstName: 'Amara',
      lastName: 'Okonkwo Reyes',
      grade: 6,
      schoolCode: 'HPMS',
      ensemble: 'Concert Band',
      instrument: 'horn',
      guardianName: 'Ngozi Okonkwo',
      guardianEmail: 'ngozi.okonkwo@merrowbasin.example',
    });
  });

  it('should store kindergarten as 0 and leave empty optional fields out when given K', () => {
    expect(rosterRowSchema.parse({ ...valid, grade: 'KG', instrument: ' ' })).toStrictEqual({
      studentId: 'HP-1001',
      firstName: 'Amara',
      lastName: 'Okonkwo-Reyes',
      grade: 0,
      schoolCode: 'HPMS',
    });
  });

  // Identifiers as student information systems write them (common practice, no source): login
  // names, e-mail-like ids, dotted and plus-suffixed ids, up to 64 characters, kept as written.
  it.each(['mary.jones', 'mary.jones@sis', 'S+00417', 'Ø-ÅSE_1', 'x'.repeat(64), '=1+2'])(
    'should keep the student id %s exactly when it is printable without spaces',
    (studentId) => {
      const row = rosterRowSchema.parse({ ...valid, studentId: `  ${studentId} ` });
      expect(row.studentId).toBe(studentId);
    },
  );

  it('should keep two ids that differ only in case apart when compared', () => {
    const upper = rosterRowSchema.parse({ ...valid, studentId: 'Mary.Jones' });
    const lower = rosterRowSchema.parse({ ...valid, studentId: 'mary.jones' });
    expect(upper.studentId).not.toBe(lower.studentId);
  });

  it('should accept a number when the grade comes from a form', () => {
    expect(rosterRowSchema.parse({ ...valid, grade: 9 }).grade).toBe(9);
  });

  it('should accept its own output when a parsed row is parsed again', () => {
    const row = rosterRowSchema.parse({ ...valid, grade: 'K', instrument: 'Cornet' });
    expect(rosterRowSchema.parse(row)).toStrictEqual(row);
  });

  it.each<[Partial<RosterRowInput>, string, string]>([
    [{ grade: '13' }, 'grade', "Grade must be K or 1 to 12; got '13'."],
    [{ grade: 'PK' }, 'grade', "Grade must be K or 1 to 12; got 'PK'."],
    [{ grade: 13 }, 'grade', "Grade must be K or 1 to 12; got '13'."],
    [{ grade: '' }, 'grade', 'Grade is required.'],
    [
      { guardianEmail: 'x@' },
      'guardianEmail',
      "Guardian e-mail 'x@' is not a valid e-mail address.",
    ],
    [
      { instrument: 'kazoo' },
      'instrument',
      "Instrument 'kazoo' is not one we know; use an instrument id or its usual name, e.g. 'Alto Saxophone'.",
    ],
    [{ lastName: '  ' }, 'lastName', 'Last name is required.'],
    [{ firstName: undefined }, 'firstName', 'First name is required.'],
    [{ firstName: 'A'.repeat(81) }, 'firstName', 'First name is longer than 80 characters.'],
    [{ studentId: '' }, 'studentId', 'Student ID is required.'],
    [
      { studentId: 'HP 1001' },
      'studentId',
      "Student ID 'HP 1001' may not contain spaces or control characters.",
    ],
    [
      { studentId: 'HP\u00071001' },
      'studentId',
      "Student ID 'HP\u00071001' may not contain spaces or control characters.",
    ],
    [
      { studentId: 'HP\u200b1001' },
      'studentId',
      "Student ID 'HP\u200b1001' may not contain spaces or control characters.",
    ],
    [
      { studentId: '1'.repeat(65) },
      'studentId',
      `Student ID '${'1'.repeat(39)}…' is longer than 64 characters.`,
    ],
    [{ schoolCode: '' }, 'schoolCode', 'School code is required.'],
    [
      { schoolCode: 'Heron Point' },
      'schoolCode',
      "School code 'Heron Point' must be 2 to 10 letters or digits, e.g. 'HPMS'.",
    ],
    [{ ensemble: 'E'.repeat(81) }, 'ensemble', 'Ensemble is longer than 80 characters.'],
    [{ guardianName: 'Una\u0007' }, 'guardianName', 'Guardian name holds a control character.'],
  ])('should explain %j on %s when the cell is wrong', (change, path, message) => {
    expect(messages({ ...valid, ...change })).toEqual([{ path: [path], message }]);
  });

  it('should report every problem of a row when several cells are wrong', () => {
    expect(
      messages({ ...valid, studentId: '', grade: '0.5', guardianEmail: 'a@@b.example' }),
    ).toEqual([
      { path: ['studentId'], message: 'Student ID is required.' },
      { path: ['grade'], message: "Grade must be K or 1 to 12; got '0.5'." },
      {
        path: ['guardianEmail'],
        message: "Guardian e-mail 'a@@b.example' is not a valid e-mail address.",
      },
    ]);
  });

  it('should say a cell must be text when it is neither text nor nothing', () => {
    expect(messages({ ...valid, firstName: 5 as unknown as string })).toEqual([
      { path: ['firstName'], message: 'First name must be text.' },
    ]);
  });
});
