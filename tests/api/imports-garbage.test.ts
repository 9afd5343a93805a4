import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { useTestApp } from '../support/test-app';

const app = useTestApp({ signIn: ['coordinator'] });
const { coordinator } = app.clients;

async function rowCounts(): Promise<number[]> {
  const [row] = rowsOf<Record<string, number>>(
    await app.database.db.execute(
      `select (select count(*)::int from students) as students, (select count(*)::int from enrollments) as enrollments, (select count(*)::int from ensembles) as ensembles, (select count(*)::int from roster_imports) as imports, (select count(*)::int from audit_log) as audit` as never,
    ),
  );
  return Object.values(row!);
}

const header = 'student_id,first_name,last_name,grade,school_code,ensemble,instrument\n';

// Uploads a roster may be: raw bytes, text with roster headers and junk cells, zip-looking bytes.
const upload = fc.oneof(
  fc.uint8Array({ maxLength: 2000 }),
  fc.string({ maxLength: 2000 }).map((text) => new TextEncoder().encode(header + text)),
  fc
    .array(fc.array(fc.string({ maxLength: 12 }), { maxLength: 8 }), { maxLength: 30 })
    .map((rows) =>
      new TextEncoder().encode(header + rows.map((cells) => cells.join(',')).join('\n')),
    ),
  fc
    .uint8Array({ maxLength: 500 })
    .map((bytes) => new Uint8Array([0x50, 0x4b, 0x03, 0x04, ...bytes])),
);
const mappingField = fc.option(
  fc.oneof(
    fc.string({ maxLength: 60 }),
    fc.jsonValue().map((value) => JSON.stringify(value)),
  ),
  { nil: undefined },
);

describe('Roster import preview with garbage', () => {
  it('should never answer 500 nor write a row when random bytes and mappings are uploaded', async () => {
    const before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(
        upload,
        mappingField,
        fc.string({ maxLength: 40 }),
        async (bytes, mapping, fileName) => {
          const answer = await coordinator.upload(
            '/api/imports/preview',
            'file',
            Buffer.from(bytes),
            fileName.replace(/["\r\n\\]/g, '') || 'x.csv',
            mapping === undefined ? {} : { mapping },
          );
          expect([200, 400]).toContain(answer.status);
        },
      ),
      { numRuns: 60 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});
