import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { readOneRosterBundle } from './oneroster';
import { listOf, modifiedAt } from './oneroster-records';

const fixture = (name: string) =>
  fileURLToPath(new URL(`../../../tests/fixtures/rosters/${name}/`, import.meta.url));
const bulk12 = fixture('oneroster-1.2-bundle');
const delta12 = fixture('oneroster-1.2-delta');
const district = {
  knownSchoolCodes: new Set(['HPMS', 'QHMS', 'TRHS', 'FBES']),
  schoolCodeByName: new Map([
    ['heron point middle', 'HPMS'],
    ['quarry hill middle', 'QHMS'],
  ]),
};

function filesOf(folder: string): Map<string, string> {
  return new Map(
    readdirSync(folder).map((name) => [name, readFileSync(`${folder}/${name}`, 'utf8')]),
  );
}

describe('readOneRosterBundle on OneRoster 1.2', () => {
  it('should read students, roles, preferred names and orgs when the manifest says 1.2', async () => {
    const parsed = await readOneRosterBundle(bulk12, district);
    expect(parsed.errors).toEqual([]);
    expect(parsed.mapping.preferredName).toBe('users.csv:preferredFirstName');
    const mary = {
      studentId: 'mary.jones',
      firstName: 'Mary',
      lastName: 'Jones',
      preferredName: 'Molly',
      grade: 7,
      schoolCode: 'HPMS',
      guardianName: 'Ruth Jones',
      guardianEmail: 'ruth.jones@merrowbasin.example',
    };
    expect(parsed.rows).toStrictEqual([
      { line: 2, row: { ...mary, ensemble: 'Symphonic Winds' } },
      { line: 3, row: { ...mary, ensemble: 'Flute Choir', instrument: 'flute' } },
      {
        line: 4,
        row: {
          studentId: 'teo+b@hp',
          firstName: 'Teo',
          lastName: 'Brandvold',
          grade: 8,
          schoolCode: 'HPMS',
          ensemble: 'Symphonic Winds',
        },
      },
      // A school without identifier, found by its name; the id keeps its case.
      {
        line: 5,
        row: {
          studentId: 'Ines.H',
          firstName: 'Ines',
          lastName: 'Halloran',
          grade: 6,
          schoolCode: 'QHMS',
          ensemble: 'String Orchestra',
        },
      },
      // In a department: the school above it.
      {
        line: 6,
        row: {
          studentId: 'li.wei',
          firstName: 'Li',
          lastName: 'Wei',
          grade: 8,
          schoolCode: 'HPMS',
        },
      },
    ]);
    // orgs: Old Annex; users: u4; classes: Jazz Lab; roles: r4 (of u4) and r8; enrolments: e5
    // (in Jazz Lab) and e6 (of u4).
    expect(parsed.skipped).toBe(7);
    expect(parsed.delta).toBeUndefined();
  });

  it('should take the 1.1 reading when the same users carry role and orgSourcedIds', async () => {
    const files = filesOf(bulk12);
    files.set(
      'manifest.csv',
      files.get('manifest.csv')!.replace('oneroster.version,1.2', 'oneroster.version,1.1'),
    );
    const parsed = await readOneRosterBundle(files, district);
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors).toContainEqual({
      line: 1,
      column: 'users.csv:role',
      message: "users.csv has no 'role' column.",
    });
  });

  it('should report a role naming a user who is not in users.csv', async () => {
    const files = filesOf(bulk12);
    files.set('roles.csv', `${files.get('roles.csv')}r10,,,u99,primary,student,,,org-hp,\r\n`);
    const parsed = await readOneRosterBundle(files, district);
    expect(parsed.errors).toEqual([
      { line: 10, column: 'roles.csv:userSourcedId', message: "User 'u99' is not in users.csv." },
    ]);
  });
});

describe('readOneRosterBundle on a delta bundle', () => {
  it('should list the changed rows and what is withdrawn or ended when the manifest says delta', async () => {
    const parsed = await readOneRosterBundle(delta12, district);
    expect(parsed.errors).toEqual([]);
    expect(
      parsed.rows.map(({ row }) => [
        row.studentId,
        row.ensemble ?? null,
        row.preferredName ?? null,
      ]),
    ).toEqual([
      ['mary.jones', null, 'Mae'],
      ['ada.k', 'Symphonic Winds', null],
    ]);
    expect(parsed.delta).toEqual({
      withdrawnStudentIds: ['teo+b@hp'],
      endedSeats: [{ studentId: 'mary.jones', schoolCode: 'HPMS', ensemble: 'Flute Choir' }],
    });
  });

  it('should not withdraw a user marked tobedeleted whose roles are not a student', async () => {
    const files = filesOf(delta12);
    files.set(
      'roles.csv',
      files.get('roles.csv')!.replace('u2,primary,student', 'u2,primary,teacher'),
    );
    const parsed = await readOneRosterBundle(files, district);
    expect(parsed.delta?.withdrawnStudentIds).toEqual([]);
  });

  it('should read a delta that leaves orgs and classes out when the manifest marks them absent', async () => {
    const files = filesOf(delta12);
    files.delete('orgs.csv');
    files.delete('classes.csv');
    files.set(
      'manifest.csv',
      files
        .get('manifest.csv')!
        .replace('file.orgs,bulk', 'file.orgs,absent')
        .replace('file.classes,bulk', 'file.classes,absent'),
    );
    // The enrolment of ada.k names a class the delta does not hold: one error, the rest reads.
    const parsed = await readOneRosterBundle(files, {
      ...district,
      schoolCodeByOrg: new Map([
        ['org-hp', 'HPMS'],
        ['org-hp-music', 'HPMS'],
      ]),
    });
    expect(parsed.errors).toEqual([
      {
        line: 4,
        column: 'enrollments.csv:classSourcedId',
        message: "Class 'c-band' is not in classes.csv.",
      },
    ]);
    expect(parsed.rows.map(({ row }) => row.studentId)).toEqual(['mary.jones']);
    expect(parsed.delta?.withdrawnStudentIds).toEqual(['teo+b@hp']);
  });
});

describe('OneRoster cell values', () => {
  // OneRoster 1.1 CSV Tables §2.3: lists are one quoted cell, comma-separated.
  it.each([
    ['09,10,11', ['09', '10', '11']],
    ['{LDAP:12},{LTI:15}', ['{LDAP:12}', '{LTI:15}']],
    ['{SIS:a,b},{LDAP:c}', ['{SIS:a,b}', '{LDAP:c}']],
    [' org-a , ,org-b ', ['org-a', 'org-b']],
    ['', []],
  ])('should split the list %j into its values', (cell, values) => {
    expect(listOf(cell)).toEqual(values);
  });

  // OneRoster 1.1 CSV Tables §2.3: dateLastModified is an ISO 8601 DateTime; exports also
  // write a Date.
  it.each([
    ['2026-09-14', '2026-09-14T00:00:00.000Z'],
    ['2026-09-14T06:00:00.000Z', '2026-09-14T06:00:00.000Z'],
    ['2026-09-14T06:00:00Z', '2026-09-14T06:00:00.000Z'],
    ['2026-09-14T08:00:00+02:00', '2026-09-14T06:00:00.000Z'],
  ])('should read the date %s', (value, instant) => {
    expect((modifiedAt(value) as Date).toISOString()).toBe(instant);
  });

  it.each(['14/09/2026', '2026-02-30', 'yesterday', '2026-13-01T00:00:00Z'])(
    'should refuse %s as a date',
    (value) => {
      expect(modifiedAt(value)).toBeUndefined();
    },
  );

  it('should report an unreadable dateLastModified on its line and still read the record', async () => {
    const files = filesOf(bulk12);
    files.set(
      'users.csv',
      files.get('users.csv')!.replace('u1,active,2026-08-01,', 'u1,active,01/08/2026,'),
    );
    const parsed = await readOneRosterBundle(files, district);
    expect(parsed.errors).toEqual([
      {
        line: 2,
        column: 'users.csv:dateLastModified',
        message:
          "dateLastModified '01/08/2026' is not a date; OneRoster writes 2026-09-01 or 2026-09-01T14:05:00.000Z.",
      },
    ]);
    expect(parsed.rows.some(({ row }) => row.studentId === 'mary.jones')).toBe(true);
  });
});
