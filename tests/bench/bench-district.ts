import type { PGlite } from '@electric-sql/pglite';
import { SeededRandom } from '../../server/seed/random';
import { firstNames, lastNames } from '../../server/seed/demo-people';

/**
 * A program's students by grade, 5 to 12: most start an instrument in grade 5 or 6 and some stop
 * at each year after (common practice, no source; the shares are invented).
 */
export const programGrades: readonly (readonly [grade: number, weight: number])[] = [
  [5, 15],
  [6, 15],
  [7, 14],
  [8, 13],
  [9, 12],
  [10, 11],
  [11, 10],
  [12, 10],
];

/** A school as the generator places students: the grades it serves (null: any). */
interface ServingSchool {
  id: number;
  lowestGrade: number | null;
  highestGrade: number | null;
}

/**
 * How students are placed: `'any'` spreads grades 4 to 12 over every school (the grid and start-up
 * sections' district, kept as measured before); `'served'` gives each student a grade of
 * {@link programGrades} and a school serving that grade, as a district's program is, so at a
 * year start only its elementary schools' last grade, its middle schools' last grade and grade 12
 * change school or status.
 */
export type BenchPlacement = 'any' | 'served';

/** The schools by id with the grades each serves. */
async function servingSchools(pglite: PGlite, schoolIds: number[]): Promise<ServingSchool[]> {
  const { rows } = await pglite.query<ServingSchool>(
    `select id, lowest_grade as "lowestGrade", highest_grade as "highestGrade"
     from schools where id = any($1::int[]) order by id`,
    [schoolIds],
  );
  return rows;
}

/** Loads N invented students spread over the given schools with COPY (fast, for benchmarks). */
export async function loadBenchStudents(
  pglite: PGlite,
  schoolIds: number[],
  count: number,
  startNumber = 900_000,
  placement: BenchPlacement = 'any',
): Promise<void> {
  const random = new SeededRandom(count);
  const schoolsByGrade = new Map<number, number[]>();
  if (placement === 'served') {
    const schools = await servingSchools(pglite, schoolIds);
    for (const [grade] of programGrades) {
      const serving = schools
        .filter(
          (school) => (school.lowestGrade ?? 0) <= grade && grade <= (school.highestGrade ?? 12),
        )
        .map((school) => school.id);
      if (serving.length === 0) throw new Error(`No school serves grade ${grade}.`);
      schoolsByGrade.set(grade, serving);
    }
  }
  const lines: string[] = [];
  for (let index = 0; index < count; index += 1) {
    const last = random.pick(lastNames).replace(/"/g, '""');
    const first = random.pick(firstNames);
    const grade = placement === 'served' ? random.weighted(programGrades) : random.integer(4, 12);
    const schoolId = random.pick(placement === 'served' ? schoolsByGrade.get(grade)! : schoolIds);
    lines.push(
      `${startNumber + index},"${first}","${last}",,${grade},${schoolId},${random.chance(0.03) ? 'withdrawn' : 'active'},"Guardian of ${first}",guardian.${startNumber + index}@families.merrowbasin.example`,
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
