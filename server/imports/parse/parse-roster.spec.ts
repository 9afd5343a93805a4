import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { detectRosterKind, parseRosterCsv, parseRosterCsvYielding } from './parse-roster';

const fixtures = new URL('../../../tests/fixtures/rosters/', import.meta.url);
const fixture = (name: string) => new Uint8Array(readFileSync(new URL(name, fixtures)));
const district = new Set(['HPMS', 'QHMS', 'TRHS', 'FBES']);
const bytesOf = (text: string) => new TextEncoder().encode(text);

describe('parseRosterCsv', () => {
  it('should read every row of the clean roster when it uses the roster columns', () => {
    const parsed = parseRosterCsv(fixture('canonical-clean.csv'), { knownSchoolCodes: district });
    expect(parsed.errors).toEqual([]);
    expect(parsed.totalRows).toBe(7);
    expect(parsed.source).toBe('csv');
    expect(parsed.rows.map((entry) => entry.line)).toEqual([2, 3, 4, 5, 6, 7, 8]);
    expect(parsed.rows[1].row).toStrictEqual({
      studentId: 'HP-1002',
      firstName: 'Tobias',
      lastName: 'Lindqvist',
      preferredName: 'Toby',
      grade: 7,
      schoolCode: 'HPMS',
      ensemble: 'Concert Band',
      instrument: 'trumpet',
      guardianName: 'Greta Lindqvist',
      guardianEmail: 'greta.lindqvist@merrowbasin.example',
    });
    expect(parsed.rows[2].row.ensemble).toBe('Jazz Band');
    expect(parsed.rows[5].row).toStrictEqual({
      studentId: 'FB-4001',
      firstName: 'Wren',
      lastName: 'Castellanos',
      grade: 0,
      schoolCode: 'FBES',
      guardianName: 'Dario Castellanos',
      guardianEmail: 'dario.castellanos@merrowbasin.example',
    });
  });

  it('should read a Windows-1252 semicolon export with its own headers when it comes from a student information system', () => {
    const parsed = parseRosterCsv(fixture('sis-export-windows1252-semicolon.csv'));
    expect(parsed.errors).toEqual([]);
    expect(parsed.mapping).toEqual({
      studentId: 'Student Number',
      firstName: 'Legal First Name',
      lastName: 'Last Name',
      preferredName: 'Nickname',
      grade: 'Grade Level',
      schoolCode: 'School',
      ensemble: 'Course',
      instrument: 'Instrument',
      guardianName: 'Parent Name',
      guardianEmail: 'Parent Email',
    });
    expect(
      parsed.rows.map(({ line, row }) => [
        line,
        row.firstName,
        row.lastName,
        row.grade,
        row.instrument,
      ]),
    ).toEqual([
      [2, 'Zoë', 'Muñoz', 6, 'alto-sax'],
      [3, 'Renée', 'Østergaard', 7, 'horn'],
      [4, 'Joaquín', 'Ibarra', 8, 'clarinet'],
      [5, 'Maëlle', 'Corbière', 0, undefined],
      [6, 'Björn', 'Halloran', 12, 'euphonium-tc'],
    ]);
    expect(parsed.rows[0].row.guardianName).toBe('Muñoz; Elena');
    expect(parsed.rows[1].row.preferredName).toBe('Ren');
  });

  it('should read quoted cells and number rows by their first line when cells hold line breaks', () => {
    const parsed = parseRosterCsv(fixture('utf8-bom-quoted-linebreaks.csv'));
    expect(parsed.errors).toEqual([]);
    expect(parsed.headers[0]).toBe('Student ID');
    expect(parsed.rows.map(({ line, row }) => [line, row.studentId, row.lastName])).toEqual([
      [2, 'TR-7001', 'Okafor, Jr.'],
      [5, 'TR-7002', 'Nguyễn'],
      [7, 'HP-7003', 'Fairweather'],
    ]);
    expect(parsed.rows[1].row).toMatchObject({
      preferredName: '"Kit"',
      ensemble: 'Strings, Advanced',
      instrument: 'viola',
    });
  });

  it('should read a tab-separated roster with short headers when it is a TSV', () => {
    const parsed = parseRosterCsv(fixture('tab-separated.tsv'), { knownSchoolCodes: district });
    expect(parsed.errors).toEqual([]);
    expect(
      parsed.rows.map(({ row }) => [row.studentId, row.grade, row.schoolCode, row.instrument]),
    ).toEqual([
      ['QH-3101', 7, 'QHMS', 'double-bass'],
      ['QH-3102', 8, 'QHMS', 'cello'],
      ['QH-3103', 6, 'QHMS', 'trumpet'],
      ['QH-3104', 8, 'QHMS', 'tuba'],
      ['QH-3105', 7, 'QHMS', 'glockenspiel'],
    ]);
    expect(parsed.rows[0].row.guardianName).toBe('Pia Marchetti');
  });

  it('should read a UTF-16LE tab-separated save when a spreadsheet wrote Unicode Text', () => {
    const parsed = parseRosterCsv(fixture('spreadsheet-unicode-text-utf16le.txt'));
    expect(parsed.errors).toEqual([]);
    expect(parsed.rows.map(({ row }) => row)).toStrictEqual([
      {
        studentId: 'FB-6001',
        firstName: 'Zoë',
        lastName: 'Łukasiewicz',
        grade: 0,
        schoolCode: 'FBES',
      },
      {
        studentId: 'FB-6002',
        firstName: 'Émile',
        lastName: 'Brontë-Ashby',
        grade: 1,
        schoolCode: 'FBES',
      },
    ]);
  });

  it('should report each bad row by line, column and message when the roster has mistakes', () => {
    const parsed = parseRosterCsv(fixture('errors-mixed.csv'), { knownSchoolCodes: district });
    expect(parsed.totalRows).toBe(10);
    expect(parsed.rows.map(({ line, row }) => [line, row.studentId, row.ensemble])).toEqual([
      [2, 'HP-5001', 'Concert Band'],
      [4, 'HP-5001', 'Jazz Band'],
    ]);
    expect(parsed.errors).toEqual([
      {
        line: 3,
        column: 'student_id',
        message: "Student 'HP-5001' is listed twice in 'Concert Band'; the first is on line 2.",
      },
      {
        line: 5,
        column: 'school_code',
        message:
          "School code 'ZZMS' is not one of the district's schools (FBES, HPMS, QHMS, TRHS).",
      },
      { line: 6, column: 'grade', message: "Grade must be K or 1 to 12; got '13'." },
      {
        line: 7,
        column: 'guardian_email',
        message: "Guardian e-mail 'x@' is not a valid e-mail address.",
      },
      {
        line: 8,
        column: 'instrument',
        message:
          "Instrument 'kazoo' is not one we know; use an instrument id or its usual name, e.g. 'Alto Saxophone'.",
      },
      { line: 9, column: 'last_name', message: 'Last name is required.' },
      {
        line: 10,
        column: 'grade',
        message:
          "Student 'HP-5001' has grade '8' here but '7' on line 2; one student has one grade.",
      },
      {
        line: 11,
        column: 'student_id',
        message: "Student ID 'HP 5007' may not contain spaces or control characters.",
      },
      { line: 11, column: 'grade', message: "Grade must be K or 1 to 12; got 'PK'." },
      {
        line: 11,
        column: 'guardian_email',
        message: "Guardian e-mail 'juno@@merrowbasin.example' is not a valid e-mail address.",
      },
    ]);
  });

  it('should accept any school code when no district school codes are given', () => {
    const parsed = parseRosterCsv(fixture('errors-mixed.csv'));
    expect(parsed.errors.some((error) => error.column === 'school_code')).toBe(false);
    expect(parsed.rows.map(({ line }) => line)).toEqual([2, 4, 5]);
  });

  it('should name the source header in errors when the file uses its own headers', () => {
    const text =
      'Student Number;First Name;Surname;Grade Level;School\r\n1001;Ana;Ruiz;Grade 13;HPMS\r\n';
    expect(parseRosterCsv(bytesOf(text)).errors).toEqual([
      { line: 2, column: 'Grade Level', message: "Grade must be K or 1 to 12; got 'Grade 13'." },
    ]);
  });

  it('should use the given mapping instead of guessing when the coordinator chose the columns', () => {
    const text = 'A,B,C,D,E,F\r\n1001,Ana,Ruiz,5,HPMS,Flute\r\n';
    const mapping = {
      studentId: 'A',
      firstName: 'B',
      lastName: 'C',
      grade: 'D',
      schoolCode: 'E',
      instrument: 'F',
    };
    const parsed = parseRosterCsv(bytesOf(text), { mapping });
    expect(parsed.errors).toEqual([]);
    expect(parsed.mapping).toBe(mapping);
    expect(parsed.rows).toStrictEqual([
      {
        line: 2,
        row: {
          studentId: '1001',
          firstName: 'Ana',
          lastName: 'Ruiz',
          grade: 5,
          schoolCode: 'HPMS',
          instrument: 'flute',
        },
      },
    ]);
  });

  it('should report each missing required column on line 1 and read no row when the file lacks them', () => {
    const parsed = parseRosterCsv(bytesOf('student_id,first_name,grade\r\n1,Ana,5\r\n'));
    expect(parsed.rows).toEqual([]);
    expect(parsed.totalRows).toBe(1);
    expect(parsed.errors).toEqual([
      {
        line: 1,
        column: 'last_name',
        message:
          'The file has no Last name column (last_name); add one or choose the column that holds it.',
      },
      {
        line: 1,
        column: 'school_code',
        message:
          'The file has no School code column (school_code); add one or choose the column that holds it.',
      },
    ]);
  });

  it('should read back cells that an export neutralised against formulas when a student id starts with a dash', () => {
    const text = "student_id,first_name,last_name,grade,school_code\r\n'-42,'=Ana,Ruiz,5,HPMS\r\n";
    expect(parseRosterCsv(bytesOf(text)).rows[0].row).toMatchObject({
      studentId: '-42',
      firstName: '=Ana',
    });
  });

  it.each([
    ['an empty file', new Uint8Array(), 'The file is empty.'],
    ['blank lines only', bytesOf('\r\n \r\n'), 'The file is empty.'],
    [
      'binary bytes',
      new Uint8Array([0x00, 0x01, 0x02, 0xff, 0x00]),
      'This file is not a text (CSV) file; export the roster as CSV and try again.',
    ],
    [
      'a zip file',
      new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00]),
      'This is a zip file (a OneRoster bundle or an Excel workbook), not a CSV file; save the sheet as CSV, or upload it as a OneRoster bundle.',
    ],
  ])('should return one error for the whole file when it is %s', (_, bytes, message) => {
    const parsed = parseRosterCsv(bytes);
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors).toEqual([{ line: 0, column: '', message }]);
  });

  it('should report a file with headers but no rows when only the header line is there', () => {
    const parsed = parseRosterCsv(bytesOf('student_id,first_name,last_name,grade,school_code\r\n'));
    expect(parsed.rows).toEqual([]);
    expect(parsed.totalRows).toBe(0);
    expect(parsed.errors).toEqual([
      { line: 1, column: '', message: 'The file has headers but no roster rows.' },
    ]);
  });

  it('should read 20,000 rows without an error when the roster is large', () => {
    const lines = [
      'Student Number,Legal First Name,Last Name,Grade Level,School,Course,Instrument,Parent Email',
    ];
    const instruments = [
      'Alto Saxophone',
      'French Horn',
      'Bb Clarinet',
      'flute',
      'Trumpet',
      'Cello',
    ];
    for (let index = 0; index < 20_000; index++) {
      lines.push(
        `S${index},Given${index},"Family, ${index}",${(index % 12) + 1}th,HPMS,Band ${index % 5},${instruments[index % 6]},p${index}@merrowbasin.example`,
      );
    }
    const bytes = bytesOf(lines.join('\r\n'));
    const parsed = parseRosterCsv(bytes, { knownSchoolCodes: district });
    expect(parsed.errors).toEqual([]);
    expect(parsed.rows).toHaveLength(20_000);
    expect(parsed.rows[19_999]).toEqual({
      line: 20_001,
      row: {
        studentId: 'S19999',
        firstName: 'Given19999',
        lastName: 'Family, 19999',
        grade: 8,
        schoolCode: 'HPMS',
        ensemble: 'Band 4',
        instrument: 'horn',
        guardianEmail: 'p19999@merrowbasin.example',
      },
    });
  });
});

describe('detectRosterKind', () => {
  it('should say zip when the bytes carry the zip signature whatever the name', () => {
    expect(detectRosterKind('roster.csv', new Uint8Array([0x50, 0x4b, 0x03, 0x04]))).toBe('zip');
    expect(detectRosterKind('empty', new Uint8Array([0x50, 0x4b, 0x05, 0x06]))).toBe('zip');
  });

  it('should say zip when the name ends in .zip and csv otherwise', () => {
    expect(detectRosterKind('Bundle.ZIP', bytesOf('not really'))).toBe('zip');
    expect(detectRosterKind('roster.csv', bytesOf('student_id'))).toBe('csv');
    expect(detectRosterKind('roster.txt', new Uint8Array())).toBe('csv');
  });
});

describe('parseRosterCsvYielding', () => {
  it('should answer what parseRosterCsv answers, letting other work run while it validates', async () => {
    const lines = ['student_id,first_name,last_name,grade,school_code,ensemble'];
    for (let index = 0; index < 3_500; index += 1)
      lines.push(
        `Y-${index},Ada,Penhallow,${(index % 12) + 1},${index % 7 ? 'HPMS' : 'NOPE'},Concert Band`,
      );
    const bytes = bytesOf(lines.join('\n'));
    let ranBetween = 0;
    const ticks = setInterval(() => (ranBetween += 1), 0);
    const yielding = await parseRosterCsvYielding(bytes, { knownSchoolCodes: district }, 0);
    clearInterval(ticks);
    expect(yielding).toStrictEqual(parseRosterCsv(bytes, { knownSchoolCodes: district }));
    expect(yielding.rows).toHaveLength(3_000);
    expect(yielding.errors).toHaveLength(500);
    expect(ranBetween).toBeGreaterThan(0);
  });
});
