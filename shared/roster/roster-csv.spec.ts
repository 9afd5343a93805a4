import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { neutraliseFormula, restoreNeutralisedCell, toRosterCsv } from './roster-csv';

describe('neutraliseFormula', () => {
  // OWASP "CSV Injection": cells starting with = + - @ tab or carriage return get a leading quote.
  it.each([
    ['=1+2', "'=1+2"],
    ['+1', "'+1"],
    ['-1', "'-1"],
    ['@SUM(A1)', "'@SUM(A1)"],
    ['\tx', "'\tx"],
    ['\rx', "'\rx"],
    ["'=x", "''=x"],
  ])('should put a single quote before %j when it starts like a formula', (cell, safe) => {
    expect(neutraliseFormula(cell)).toBe(safe);
  });

  it.each(['Amara', '', 'a=b', "O'Neil", "'quoted", ' =x'])(
    'should leave %j alone when it does not start like a formula',
    (cell) => {
      expect(neutraliseFormula(cell)).toBe(cell);
    },
  );

  it('should be undone by restoreNeutralisedCell when any text is neutralised and read back', () => {
    fc.assert(
      fc.property(fc.string(), (cell) => {
        expect(restoreNeutralisedCell(neutraliseFormula(cell))).toBe(cell);
      }),
    );
  });
});

describe('toRosterCsv', () => {
  it('should write the roster columns, CRLF line breaks, quotes and neutralised cells when given rows', () => {
    const csv = toRosterCsv([
      {
        studentId: 'HP-1001',
        firstName: 'Amara',
        lastName: 'Okafor, Jr.',
        preferredName: '"Kit"',
        grade: 0,
        schoolCode: 'HPMS',
        ensemble: '=HYPERLINK("x")',
        instrument: 'alto-sax',
        guardianName: '-Ngozi',
        guardianEmail: 'ngozi@merrowbasin.example',
      },
      { studentId: 'TR-2', firstName: 'Hana', lastName: 'Sato', grade: 12, schoolCode: 'TRHS' },
    ]);
    // RFC 4180 section 2: CRLF between records, fields with commas or quotes quoted, quotes doubled.
    expect(csv).toBe(
      'student_id,first_name,last_name,preferred_name,grade,school_code,ensemble,instrument,guardian_name,guardian_email\r\n' +
        `HP-1001,Amara,"Okafor, Jr.","""Kit""",K,HPMS,"'=HYPERLINK(""x"")",alto-sax,'-Ngozi,ngozi@merrowbasin.example\r\n` +
        'TR-2,Hana,Sato,,12,TRHS,,,,\r\n',
    );
  });

  // OWASP "CSV Injection": ids districts use may start with '+', '-', '@' or '='; written out they
  // are neutralised like any other cell.
  it('should neutralise a student id a spreadsheet would read as a formula when writing it', () => {
    const csv = toRosterCsv([
      {
        studentId: '@mary.jones',
        firstName: 'Mary',
        lastName: 'Jones',
        grade: 7,
        schoolCode: 'HPMS',
      },
      {
        studentId: '+417.b',
        firstName: 'Teo',
        lastName: 'Brandvold',
        grade: 8,
        schoolCode: 'HPMS',
      },
      {
        studentId: 'mary.jones',
        firstName: 'Mary',
        lastName: 'Jonas',
        grade: 7,
        schoolCode: 'HPMS',
      },
    ]);
    const ids = csv
      .split('\r\n')
      .slice(1, 4)
      .map((line) => line.split(',')[0]);
    expect(ids).toEqual(["'@mary.jones", "'+417.b", 'mary.jones']);
    expect(ids.map((id) => restoreNeutralisedCell(id!))).toEqual([
      '@mary.jones',
      '+417.b',
      'mary.jones',
    ]);
  });

  it('should write only the header when there are no rows', () => {
    expect(toRosterCsv([])).toBe(
      'student_id,first_name,last_name,preferred_name,grade,school_code,ensemble,instrument,guardian_name,guardian_email\r\n',
    );
  });
});
