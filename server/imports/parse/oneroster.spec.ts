import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { strToU8, zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { readOneRosterBundle } from './oneroster';

const bundleFolder = fileURLToPath(
  new URL('../../../tests/fixtures/rosters/oneroster-bundle/', import.meta.url),
);
const bundleFiles = () =>
  new Map(
    readdirSync(bundleFolder).map((name) => [
      name,
      readFileSync(`${bundleFolder}/${name}`, 'utf8'),
    ]),
  );

/** The fixture bundle with one file's text changed. */
function bundleWith(name: string, change: (text: string) => string): Map<string, string> {
  const files = bundleFiles();
  files.set(name, change(files.get(name) ?? ''));
  return files;
}

const vanTongeren = {
  studentId: 'HP-8001',
  firstName: 'Imre',
  lastName: 'Van Tongeren',
  grade: 7,
  schoolCode: 'HPMS',
  guardianName: 'Beatrix Van Tongeren',
  guardianEmail: 'beatrix.vantongeren@merrowbasin.example',
};

const expectedRows = [
  { line: 2, row: { ...vanTongeren, ensemble: 'Concert Band' } },
  {
    line: 6,
    row: { ...vanTongeren, ensemble: 'Beginning Band - Clarinet', instrument: 'clarinet' },
  },
  {
    line: 3,
    row: {
      studentId: 'HP-8002',
      firstName: 'Callum',
      lastName: 'Ashdown',
      grade: 6,
      schoolCode: 'HPMS',
      ensemble: 'Beginning Band - Clarinet',
      instrument: 'clarinet',
      guardianName: 'Hollis Ashdown',
      guardianEmail: 'hollis.ashdown@merrowbasin.example',
    },
  },
  {
    line: 5,
    row: {
      studentId: 'TR-8003',
      firstName: 'Odalys',
      lastName: 'Ferreira',
      grade: 11,
      schoolCode: 'TRHS',
      ensemble: 'Chamber Orchestra',
      guardianName: 'Marisol Ferreira',
      guardianEmail: 'marisol.ferreira@merrowbasin.example',
    },
  },
  {
    line: 5,
    row: {
      studentId: 'u-s4',
      firstName: 'Pim',
      lastName: 'Ravensworth',
      grade: 0,
      schoolCode: 'FBES',
    },
  },
  {
    line: 7,
    row: {
      studentId: 'QH-8005',
      firstName: 'Saoirse',
      lastName: 'Delacroix',
      grade: 7,
      schoolCode: 'QHMS',
      ensemble: 'Strings 7',
      instrument: 'violin',
    },
  },
];

describe('readOneRosterBundle', () => {
  it('should make one row per student and class when reading the fixture folder', async () => {
    const parsed = await readOneRosterBundle(bundleFolder);
    expect(parsed.errors).toEqual([]);
    expect(parsed.source).toBe('oneroster');
    expect(parsed.totalRows).toBe(6);
    expect(parsed.rows).toStrictEqual(expectedRows);
    expect(parsed.headers).toContain('users.csv:agentSourcedIds');
    expect(parsed.mapping.grade).toBe('users.csv:grades');
  });

  it('should read the same rows when the folder is zipped, even inside a sub-folder', async () => {
    const entries = Object.fromEntries(
      [...bundleFiles()].map(([name, text]) => [`export-2026/${name}`, strToU8(text)]),
    );
    const parsed = await readOneRosterBundle(zipSync(entries));
    expect(parsed.errors).toEqual([]);
    expect(parsed.rows).toStrictEqual(expectedRows);
  });

  it('should read the same rows when given the files as a map', async () => {
    expect((await readOneRosterBundle(bundleFiles())).rows).toStrictEqual(expectedRows);
  });

  it('should name the file, line and column once when a student has a grade outside K to 12', async () => {
    const files = bundleWith('users.csv', (text) =>
      text.replace(
        'Imre,Van Tongeren,,HP-8001,,,,u-g1,07',
        'Imre,Van Tongeren,,HP-8001,,,,u-g1,PK',
      ),
    );
    const parsed = await readOneRosterBundle(files);
    expect(parsed.errors).toEqual([
      { line: 2, column: 'users.csv:grades', message: "Grade must be K or 1 to 12; got 'PK'." },
    ]);
    expect(parsed.rows.map(({ row }) => row.studentId)).not.toContain('HP-8001');
  });

  it('should report a bad guardian e-mail on the guardian line when the parent record is wrong', async () => {
    const files = bundleWith('users.csv', (text) =>
      text.replace('beatrix.vantongeren@merrowbasin.example', 'beatrix@'),
    );
    expect((await readOneRosterBundle(files)).errors).toEqual([
      {
        line: 7,
        column: 'users.csv:email',
        message: "Guardian e-mail 'beatrix@' is not a valid e-mail address.",
      },
    ]);
  });

  it('should report an org that matches no school on its orgs.csv line when it has no identifier', async () => {
    const files = bundleWith('orgs.csv', (text) => text.replace('school,TRHS,', 'school,,'));
    const parsed = await readOneRosterBundle(files, {
      knownSchoolCodes: new Set(['HPMS', 'QHMS', 'TRHS', 'FBES']),
    });
    expect(parsed.errors).toEqual([
      {
        line: 5,
        column: 'orgs.csv:identifier',
        message:
          "Org 'Tamsin Ridge High' (sourcedId 'org-trhs', no identifier) matches no school of the district by identifier, saved mapping or name; choose its school in the import's mapping step.",
      },
    ]);
    expect(parsed.unmappedOrgs).toEqual([
      { sourcedId: 'org-trhs', name: 'Tamsin Ridge High', identifier: '', type: 'school', line: 5 },
    ]);
    expect(parsed.rows).toHaveLength(5);
  });

  it('should find a school without identifier by its name, then by a saved mapping', async () => {
    const files = bundleWith('orgs.csv', (text) => text.replace('school,TRHS,', 'school,,'));
    const knownSchoolCodes = new Set(['HPMS', 'QHMS', 'TRHS', 'FBES']);
    const byName = await readOneRosterBundle(files, {
      knownSchoolCodes,
      schoolCodeByName: new Map([['tamsin ridge high', 'TRHS']]),
    });
    expect(byName.errors).toEqual([]);
    expect(byName.rows.find(({ row }) => row.studentId === 'TR-8003')?.row.schoolCode).toBe('TRHS');
    const bySaved = await readOneRosterBundle(
      bundleWith('orgs.csv', (text) =>
        text.replace('Tamsin Ridge High,school,TRHS', 'TRHS Campus,school,'),
      ),
      { knownSchoolCodes, schoolCodeByOrg: new Map([['org-trhs', 'TRHS']]) },
    );
    expect(bySaved.errors).toEqual([]);
    expect(bySaved.rows).toStrictEqual(byName.rows);
  });

  it('should report enrolments in unknown classes and of unknown students when references break', async () => {
    const files = bundleWith('enrollments.csv', (text) =>
      text
        .replace('e-4,,,class-tr-chamber', 'e-4,,,class-gone')
        .replace('e-6,,,class-qh-strings,,u-s5', 'e-6,,,class-qh-strings,,u-s9'),
    );
    expect((await readOneRosterBundle(files)).errors).toEqual([
      {
        line: 5,
        column: 'enrollments.csv:classSourcedId',
        message: "Class 'class-gone' is not in classes.csv.",
      },
      {
        line: 7,
        column: 'enrollments.csv:userSourcedId',
        message: "Student 'u-s9' is not in users.csv.",
      },
    ]);
  });

  it('should report a school not in the district when known school codes are given', async () => {
    const parsed = await readOneRosterBundle(bundleFolder, {
      knownSchoolCodes: new Set(['HPMS', 'QHMS', 'TRHS']),
    });
    expect(parsed.errors).toEqual([
      {
        line: 6,
        column: 'orgs.csv:identifier',
        message:
          "Org 'Firthbarrow Elementary' (sourcedId 'org-fbes', identifier 'FBES') matches no school of the district by identifier, saved mapping or name; choose its school in the import's mapping step.",
      },
    ]);
  });

  it('should name the teacher when an enrolment as a student names a teacher', async () => {
    const files = bundleWith('enrollments.csv', (text) =>
      text.replace('e-6,,,class-qh-strings,,u-s5', 'e-6,,,class-qh-strings,,u-t1'),
    );
    expect((await readOneRosterBundle(files)).errors).toEqual([
      {
        line: 7,
        column: 'enrollments.csv:userSourcedId',
        message:
          "User 'u-t1' is enrolled as a student, but users.csv line 11 gives them the role teacher.",
      },
    ]);
  });

  it('should name the class and the org when a class is in an org that is not there', async () => {
    const files = bundleWith('classes.csv', (text) =>
      text.replace(
        'Strings 7,07,course-orch,QH-S7,scheduled,Room 9,org-qhms',
        'Strings 7,07,course-orch,QH-S7,scheduled,Room 9,org-gone',
      ),
    );
    expect((await readOneRosterBundle(files)).errors).toEqual([
      {
        line: 5,
        column: 'classes.csv:schoolSourcedId',
        message: "Org 'org-gone' is not in orgs.csv.",
      },
    ]);
  });

  // OneRoster 1.1 CSV Tables §2.3: a record marked tobedeleted is gone, and so are the records
  // that point at it.
  it('should skip and count a class marked tobedeleted and its enrolments, without an error', async () => {
    const files = bundleWith('classes.csv', (text) =>
      text.replace('class-tr-chamber,,,', 'class-tr-chamber,tobedeleted,2026-09-01T08:00:00.000Z,'),
    );
    const parsed = await readOneRosterBundle(files);
    expect(parsed.errors).toEqual([]);
    // The student stays on the roster, in no ensemble.
    expect(parsed.rows.filter(({ row }) => row.studentId === 'TR-8003')).toEqual([
      { line: 4, row: expect.not.objectContaining({ ensemble: expect.anything() }) },
    ]);
    // The class, its one student enrolment (e-4) and the already deleted enrolment e-7.
    expect(parsed.skipped).toBe(3);
  });

  it('should report two students with one identifier when users.csv repeats it', async () => {
    const files = bundleWith('users.csv', (text) => text.replace(',QH-8005,', ',HP-8002,'));
    expect((await readOneRosterBundle(files)).errors).toEqual([
      {
        line: 6,
        column: 'users.csv:givenName',
        message:
          "Student 'HP-8002' has first name 'Saoirse' here but 'Callum' on enrollments.csv line 3; one student has one first name.",
      },
    ]);
  });

  // OneRoster 1.1 CSV Tables §2.2: file.<name> is absent, bulk or delta; oneroster.version 1.1.
  it.each([
    [
      'file.enrollments,bulk',
      'file.enrollments,absent',
      11,
      'manifest.csv says enrollments.csv is absent; a bulk roster import needs it.',
    ],
    [
      'file.users,bulk',
      'file.users,sometimes',
      16,
      "manifest.csv gives file.users as 'sometimes'; it must be bulk, delta or absent.",
    ],
    [
      'oneroster.version,1.1',
      'oneroster.version,1.3',
      3,
      "The bundle is OneRoster version '1.3'; this import reads OneRoster 1.1 and 1.2 CSV bundles.",
    ],
  ])(
    'should refuse the bundle when the manifest line %s becomes %s',
    async (from, to, line, message) => {
      const parsed = await readOneRosterBundle(
        bundleWith('manifest.csv', (text) => text.replace(from, to)),
      );
      expect(parsed.rows).toEqual([]);
      expect(parsed.errors).toEqual([{ line, column: 'manifest.csv:value', message }]);
    },
  );

  it('should name each missing file and column when the bundle is incomplete', async () => {
    const files = bundleWith('users.csv', (text) => text.replace(',role,', ',roles,'));
    files.delete('classes.csv');
    files.delete('manifest.csv');
    const parsed = await readOneRosterBundle(files);
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors).toEqual([
      {
        line: 0,
        column: 'manifest.csv',
        message: 'The bundle has no manifest.csv; a OneRoster CSV bundle starts with one.',
      },
      { line: 1, column: 'users.csv:role', message: "users.csv has no 'role' column." },
      { line: 0, column: 'classes.csv', message: 'The bundle has no classes.csv.' },
    ]);
  });

  it('should say the zip could not be read when the bytes are not a zip', async () => {
    const parsed = await readOneRosterBundle(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]));
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors[0]).toMatchObject({ line: 0, column: '' });
    expect(parsed.errors[0].message).toMatch(/^The zip file could not be read/);
  });

  it('should say a workbook is not a bundle when the zip is an Excel file', async () => {
    const workbook = zipSync({
      '[Content_Types].xml': strToU8('<Types/>'),
      'xl/workbook.xml': strToU8('<workbook/>'),
    });
    const parsed = await readOneRosterBundle(workbook);
    expect(parsed.errors[0]).toEqual({
      line: 0,
      column: '',
      message: 'This is an Excel workbook, not a OneRoster bundle; save the sheet as CSV.',
    });
  });

  it('should say the folder could not be read when the path does not exist', async () => {
    const parsed = await readOneRosterBundle(`${bundleFolder}/missing`);
    expect(parsed.errors[0].message).toMatch(/^The folder '.*missing' could not be read/);
  });

  it('should refuse a zip whose roster files declare more than 256 MB together, before inflating any', async () => {
    const zip = zipSync({
      'users.csv': strToU8('sourcedId\n'),
      'enrollments.csv': strToU8('sourcedId\n'),
    });
    // APPNOTE.TXT (PKWARE .ZIP File Format Specification) §4.3.7 and §4.3.12: the uncompressed
    // size sits at offset 22 of a local file header and offset 24 of a central directory header.
    const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
    for (let offset = 0; offset + 4 <= zip.length; offset++) {
      const signature = view.getUint32(offset, true);
      if (signature === 0x04034b50) view.setUint32(offset + 22, 150 * 1024 * 1024, true);
      if (signature === 0x02014b50) view.setUint32(offset + 24, 150 * 1024 * 1024, true);
    }
    const before = process.memoryUsage().arrayBuffers;
    const parsed = await readOneRosterBundle(zip);
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors.map((error) => error.message)).toContainEqual(
      expect.stringMatching(/more than 256 MB once unpacked/),
    );
    // Nothing near the declared 150 MB was allocated.
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(50 * 1024 * 1024);
  });

  it('should not inflate a zip nested inside the bundle', async () => {
    const inner = zipSync({ 'users.csv': strToU8('sourcedId\n') });
    const parsed = await readOneRosterBundle(zipSync({ 'nested.zip': inner }));
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors.length).toBeGreaterThan(0);
  });
});
