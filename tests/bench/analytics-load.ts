import { sql } from 'drizzle-orm';
import type { DatabaseHandle } from '../../server/db/client';
import { rowsOf } from '../../server/db/client';
import { appliesTo } from '@shared/ladder/index';
import { activeRuleLadder } from '../../server/ladder/ladder-queries';
import { familyOf } from '../../server/ladder/student-families';
import { SeededRandom } from '../../server/seed/random';

const benchInstruments = [
  'flute',
  'clarinet',
  'alto-sax',
  'trumpet',
  'trombone',
  'horn',
  'violin',
  'viola',
  'cello',
  'marimba',
];
const dayMs = 24 * 60 * 60 * 1000;

/**
 * Gives every student without a seat one (so each has an instrument family), then loads
 * invented pass-offs with COPY until the district holds `total`: each student climbs the
 * active ladder in order, with about one "not yet" in five, heard between 17 August and today.
 */
export async function loadBenchPassOffs(database: DatabaseHandle, total: number): Promise<void> {
  const { db, pglite } = database;
  const random = new SeededRandom(total);
  // Bands of 60, as a school's ensembles would seat them.
  const unseated = sql`not exists (select 1 from enrollments x where x.student_id = s.id)`;
  await db.execute(sql`
    insert into ensembles (school_id, name, kind)
    select c.school_id, 'Bench Band ' || g, 'concert-band'
    from (select s.school_id, count(*) as students from students s where ${unseated} group by 1) c,
      generate_series(1, ceil(c.students / 60.0)::int) g`);
  await db.execute(sql`
    with pupils as (
      select s.id, s.school_id, (row_number() over (partition by s.school_id order by s.id) - 1) / 60 as band
      from students s where ${unseated}),
    bands as (
      select e.id, e.school_id, row_number() over (partition by e.school_id order by e.id) - 1 as band
      from ensembles e where e.name like 'Bench Band %')
    insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id)
    select p.id, b.id, (select y.id from school_years y where y.current limit 1),
      (${`{${benchInstruments.join(',')}}`}::text[])[1 + p.id % ${benchInstruments.length}]
    from pupils p join bands b on b.school_id = p.school_id and b.band = p.band`);
  const ladder = (await activeRuleLadder(db))!;
  const requirementIds = new Map(
    rowsOf<{ id: number; code: string }>(
      await db.execute(
        sql`select id, code from ladder_requirements where ladder_version_id = ${ladder.versionId}`,
      ),
    ).map((row) => [row.code, row.id]),
  );
  const directors = new Map(
    rowsOf<{ school_id: number; user_id: number }>(
      await db.execute(
        sql`select us.school_id, min(us.user_id) as user_id from user_schools us join users u on u.id = us.user_id where u.role = 'director' group by us.school_id`,
      ),
    ).map((row) => [row.school_id, row.user_id]),
  );
  const pupils = rowsOf<{
    id: number;
    school_id: number;
    grade: number;
    instrument_id: string | null;
  }>(
    await db.execute(sql`select s.id, s.school_id, s.grade::int as grade, seat.instrument_id
      from students s
      left join (select distinct on (e.student_id) e.student_id, e.instrument_id from enrollments e order by e.student_id, e.id) seat
        on seat.student_id = s.id
      where not exists (select 1 from pass_offs p where p.student_id = s.id) order by s.id`),
  );
  const [existing] = rowsOf<{ count: number }>(
    await db.execute(sql`select count(*)::int as count from pass_offs`),
  );
  const wanted = Math.max(0, total - existing!.count);
  const perStudent = pupils.length ? wanted / pupils.length : 0;
  const start = Date.parse('2026-08-17T00:00:00Z');
  const span = Math.max(1, Math.floor((Date.parse('2026-12-01T00:00:00Z') - start) / dayMs));
  const lines: string[] = [];
  pupils.forEach((pupil, index) => {
    const family = familyOf(pupil.instrument_id);
    const requirements = ladder.rungs.flatMap((rung) =>
      rung.requirements.filter((requirement) => appliesTo(requirement, family)),
    );
    const budget = Math.round(perStudent * (index + 1)) - Math.round(perStudent * index);
    const days = Array.from({ length: budget }, () => random.integer(0, span)).sort(
      (first, second) => first - second,
    );
    let position = 0;
    for (const day of days) {
      const requirement = requirements[Math.min(position, requirements.length - 1)]!;
      const passed = !random.chance(0.2);
      if (passed) position += 1;
      const heardOn = new Date(start + day * dayMs).toISOString().slice(0, 10);
      lines.push(
        `${pupil.id},${pupil.school_id},${pupil.grade},${ladder.versionId},${requirementIds.get(requirement.id)},${requirement.id},${heardOn},${requirement.tempo + random.pick([-4, 0, 0, 4])},${passed},${directors.get(pupil.school_id) ?? ''},""`,
      );
    }
  });
  // Bench data is consistent by construction: skip the per-row foreign-key triggers while loading.
  await pglite!.query('SET session_replication_role = replica');
  for (let offset = 0; offset < lines.length; offset += 200_000) {
    await pglite!.query(
      `COPY pass_offs (student_id, school_id, grade, ladder_version_id, requirement_id, requirement_code, heard_on, tempo, passed, heard_by, note) FROM '/dev/blob' WITH (FORMAT csv)`,
      [],
      { blob: new Blob([lines.slice(offset, offset + 200_000).join('\n')]) },
    );
  }
  await pglite!.query('SET session_replication_role = DEFAULT');
  await pglite!.query('ANALYZE pass_offs');
  await pglite!.query('ANALYZE enrollments');
}
