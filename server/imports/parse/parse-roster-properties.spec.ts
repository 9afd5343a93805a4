import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  instrumentIds,
  rosterColumnNames,
  rosterFields,
  rosterRowSchema,
  toRosterCsv,
  type RosterRow,
} from '@shared/roster';
import { readOneRosterBundle } from './oneroster';
import { parseRosterCsv } from './parse-roster';
import type { ParsedRoster } from './parsed-roster';

// Characters that test quoting, neutralising and white space, plus any code point.
const nameUnit = fc.oneof(
  fc.constantFrom(',', '"', "'", '-', '=', '+', '@', ' ', '\t', '\r\n', ';', 'é', 'Ł', '語'),
  fc.constantFrom(...'abcdefghijklmnopqrstuvwxyzABCXYZ'),
  fc.string({ unit: 'binary', minLength: 1, maxLength: 1 }),
);
const name = (minLength: number) => fc.string({ unit: nameUnit, minLength, maxLength: 40 });
const optionalText = () => fc.option(name(0), { nil: undefined });
const email = fc.oneof(
  fc.stringMatching(/^[a-z0-9'+-][a-z0-9._'+-]{0,20}@[a-z0-9-]{1,20}\.[a-z]{2,6}$/),
  fc.emailAddress(),
);

// Rows as the schema makes them: generated cells, kept when the schema accepts them.
const validRow: fc.Arbitrary<RosterRow> = fc
  .record({
    studentId: fc.stringMatching(/^[A-Za-z0-9_-]{1,40}$/),
    firstName: name(1),
    lastName: name(1),
    preferredName: optionalText(),
    grade: fc.integer({ min: 0, max: 12 }),
    schoolCode: fc.stringMatching(/^[A-Z0-9]{2,10}$/),
    ensemble: optionalText(),
    instrument: fc.option(fc.constantFrom(...instrumentIds), { nil: undefined }),
    guardianName: optionalText(),
    guardianEmail: fc.option(email, { nil: undefined }),
  })
  .map((cells) => rosterRowSchema.safeParse(cells))
  .filter((result) => result.success)
  .map((result) => result.data as RosterRow);

function expectOnlyValidRows(parsed: ParsedRoster): void {
  for (const { line, row } of parsed.rows) {
    expect(line).toBeGreaterThanOrEqual(2);
    expect(rosterRowSchema.parse(row)).toStrictEqual(row);
  }
  for (const error of parsed.errors) {
    expect(error.line).toBeGreaterThanOrEqual(0);
    expect(typeof error.column).toBe('string');
    expect(error.message.length).toBeGreaterThan(0);
  }
  expect(parsed.rows.length).toBeLessThanOrEqual(parsed.totalRows);
}

// Pieces of CSV that random files are built from, so that some of them map and hold rows.
const csvPiece = fc.oneof(
  fc.constantFrom(',', ';', '\t', '"', '""', '\r\n', '\n', '\r', ' ', "'", '=', 'K', '13', '5th'),
  fc.constantFrom(...rosterFields.map((field) => rosterColumnNames[field])),
  fc.constantFrom('HPMS', 'hp-1', 'Ana', 'x@', 'a@merrowbasin.example', 'Cornet', 'kazoo'),
  fc.string({ unit: 'binary', maxLength: 6 }),
);

describe('parseRosterCsv', () => {
  it('should give back the same rows when valid rows are written by toRosterCsv and read again', () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(validRow, { selector: (row) => row.studentId, maxLength: 25 }),
        (rows) => {
          const parsed = parseRosterCsv(new TextEncoder().encode(toRosterCsv(rows)));
          if (rows.length === 0) {
            expect(parsed.errors).toEqual([
              { line: 1, column: '', message: 'The file has headers but no roster rows.' },
            ]);
            return;
          }
          expect(parsed.errors).toEqual([]);
          expect(parsed.rows.map((entry) => entry.row)).toStrictEqual(rows);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('should never throw and only return valid rows when the text is random', () => {
    fc.assert(
      fc.property(fc.array(csvPiece, { maxLength: 80 }), (pieces) => {
        expectOnlyValidRows(parseRosterCsv(new TextEncoder().encode(pieces.join(''))));
      }),
      { numRuns: 500 },
    );
  });

  it('should never throw and only return valid rows when the bytes are random', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), (bytes) => {
        expectOnlyValidRows(parseRosterCsv(bytes));
      }),
      { numRuns: 300 },
    );
  });
});

describe('readOneRosterBundle', () => {
  it('should never reject and only return valid rows when the zip bytes are random', async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 300 }), async (bytes) => {
        expectOnlyValidRows(await readOneRosterBundle(bytes));
      }),
      { numRuns: 100 },
    );
  });

  it('should never reject and only return valid rows when the bundle files hold random text', async () => {
    const fileText = fc.array(csvPiece, { maxLength: 40 }).map((pieces) => pieces.join(''));
    await fc.assert(
      fc.asyncProperty(
        fileText,
        fileText,
        fileText,
        fileText,
        async (orgs, users, classes, enrollments) => {
          const bundle = new Map([
            ['manifest.csv', 'propertyName,value\noneroster.version,1.1\n'],
            ['orgs.csv', `sourcedId,name,type,identifier\n${orgs}`],
            [
              'users.csv',
              `sourcedId,orgSourcedIds,role,givenName,familyName,grades,identifier\n${users}`,
            ],
            ['classes.csv', `sourcedId,title,schoolSourcedId\n${classes}`],
            [
              'enrollments.csv',
              `sourcedId,classSourcedId,schoolSourcedId,userSourcedId,role\n${enrollments}`,
            ],
          ]);
          expectOnlyValidRows(await readOneRosterBundle(bundle));
        },
      ),
      { numRuns: 200 },
    );
  });
});
