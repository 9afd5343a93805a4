import type { PGlite } from '@electric-sql/pglite';
import { SeededRandom } from '../../server/seed/random';
import { firstNames, lastNames } from '../../server/seed/demo-people';

/** Loads N invented students spread over the given schools with COPY (fast, for benchmarks). */
export async function loadBenchStudents(
  pglite: PGlite,
  schoolIds: number[],
  count: number,
  startNumber = 900_000,
): Promise<void> {
  const random = new SeededRandom(count);
  const lines: string[] = [];
  for (let index = 0; index < count; index += 1) {
    const last = random.pick(lastNames).replace(/"/g, '""');
    const first = random.pick(firstNames);
    const grade = random.integer(4, 12);
    lines.push(
      `${startNumber + index},"${first}","${last}",,${grade},${random.pick(schoolIds)},${random.chance(0.03) ? 'withdrawn' : 'active'},"Guardian of ${first}",guardian.${startNumber + index}@families.merrowbasin.example`,
    );
  }
  await pglite.query(
    `COPY students (student_number, first_name, last_name, preferred_name, grade, school_id, status, guardian_name, guardian_email) FROM '/dev/blob' WITH (FORMAT csv)`,
    [],
    { blob: new Blob([lines.join('\n')]) },
  );
  // What the product does after an import (refreshStatistics, server/db/statistics.ts).
  await pglite.query('VACUUM (ANALYZE) students');
}
