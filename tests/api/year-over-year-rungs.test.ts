import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { currentRung, type Rung } from '@shared/ladder/index';
import { yearOverYearSchema, type RungByGrade } from '@shared/api/year-over-year';
import { rowsOf } from '../../server/db/client';
import { activeRuleLadder } from '../../server/ladder/ladder-queries';
import { passOffsByStudent } from '../support/pass-off-records';
import { plainMedian } from '../support/plain-median';
import { rungCountDrift } from '../support/rung-counts';
import { startTestApp, type StartedTestApp } from '../support/test-app';

type App = StartedTestApp<'coordinator' | 'director.hpms'>;
let app: App;
let rungs: Rung[];
let years: { name: string; starts_on: string; ends_on: string }[];

const dayMs = 86_400_000;
const addDays = (day: string, days: number) =>
  new Date(Date.parse(`${day}T00:00:00Z`) + days * dayMs).toISOString().slice(0, 10);

beforeAll(async () => {
  app = await startTestApp({ signIn: ['coordinator', 'director.hpms'] });
  rungs = (await activeRuleLadder(app.database.db))!.rungs;
  years = rowsOf(
    await app.database.db.execute(sql`
      select name, starts_on::text as starts_on, ends_on::text as ends_on from school_years
      order by starts_on`),
  );
});
afterAll(() => app?.close());

interface Player {
  student_id: number;
  grade: number;
  code: string;
  family: string;
}

/**
 * The figure worked out plainly: every player's rung on the day from all their pass-offs heard up
 * to it (the whole history, not the stored rung dates), by the ladder rules, then each grade's
 * median and count.
 */
async function plainFigure(
  players: Player[],
  day: string,
): Promise<Map<number, { median: number | null; students: number }>> {
  const byStudent = await passOffsByStudent(app.database.db, day);
  const byGrade = new Map<number, number[]>();
  for (const player of players) {
    const rung = currentRung(rungs, byStudent.get(player.student_id) ?? [], player.family);
    byGrade.set(player.grade, [...(byGrade.get(player.grade) ?? []), rung]);
  }
  return new Map(
    [...byGrade].map(([grade, values]) => [
      grade,
      { median: plainMedian(values), students: values.length },
    ]),
  );
}

/** This year's players (active now) and last year's (its history rows not ended withdrawn). */
async function players() {
  const current = rowsOf<Player>(
    await app.database.db.execute(sql`
      select s.id as student_id, s.grade, sc.code, coalesce(a.family, '') as family
      from students s join schools sc on sc.id = s.school_id
      left join student_attainment a on a.student_id = s.id
      where s.status = 'active'`),
  );
  const previous = rowsOf<Player>(
    await app.database.db.execute(sql`
      select sy.student_id, sy.grade, sc.code, coalesce(a.family, '') as family
      from student_years sy join school_years y on y.id = sy.school_year_id and y.name = '2025-26'
      join schools sc on sc.id = sy.school_id
      left join student_attainment a on a.student_id = sy.student_id
      where sy.outcome <> 'withdrawn'`),
  );
  return { current, previous };
}

function expectFigure(
  figure: RungByGrade,
  current: Map<number, { median: number | null; students: number }>,
  previous: Map<number, { median: number | null; students: number }>,
) {
  const grades = [...new Set([...current.keys(), ...previous.keys()])].sort((a, b) => a - b);
  expect(figure.grades.map((row) => row.grade)).toEqual(grades);
  for (const row of figure.grades) {
    expect(row.current, `grade ${row.grade} this year`).toEqual(
      current.get(row.grade) ?? { median: null, students: 0 },
    );
    expect(row.previous, `grade ${row.grade} last year`).toEqual(
      previous.get(row.grade) ?? { median: null, students: 0 },
    );
  }
}

describe('Rung by grade, this year against last year at the same point of the year', () => {
  it('should give each grade’s median rung and count on a day as the ladder rules count them from every pass-off', async () => {
    const [last, now] = [years.at(-2)!, years.at(-1)!];
    const day = addDays(now.starts_on, 75);
    const response = await app.clients.coordinator.get(`/api/analytics/year-over-year?asOf=${day}`);
    expect(response.status).toBe(200);
    const figure = yearOverYearSchema.parse(response.body).rungByGrade;
    expect(figure).toMatchObject({ asOf: day, day: 75, previousAsOf: addDays(last.starts_on, 75) });
    const { current, previous } = await players();
    expectFigure(
      figure,
      await plainFigure(current, day),
      await plainFigure(previous, addDays(last.starts_on, 75)),
    );
    // The demo's invented year: by the same day, students have climbed (a real difference).
    expect(figure.grades.some((row) => row.current.median !== row.previous.median)).toBe(true);
    expect(figure.grades.every((row) => row.current.students > 0)).toBe(true);
  });

  it('should read today by default, and keep a director to their school', async () => {
    const figure = yearOverYearSchema.parse(
      (await app.clients['director.hpms'].get('/api/analytics/year-over-year')).body,
    ).rungByGrade;
    const now = years.at(-1)!;
    const today = new Date().toISOString().slice(0, 10);
    // The demo's current year holds today (its dates follow the day it is seeded).
    expect(figure.asOf <= now.ends_on && figure.asOf >= now.starts_on).toBe(true);
    expect(Math.abs(Date.parse(figure.asOf) - Date.parse(today))).toBeLessThanOrEqual(dayMs);
    const { current, previous } = await players();
    expectFigure(
      figure,
      await plainFigure(
        current.filter((player) => player.code === 'HPMS'),
        figure.asOf,
      ),
      await plainFigure(
        previous.filter((player) => player.code === 'HPMS'),
        figure.previousAsOf!,
      ),
    );
  });

  it('should follow a pass-off removed, at once', async () => {
    const now = years.at(-1)!;
    const day = addDays(now.starts_on, 90);
    // A passed pass-off heard in the current year by then, of a student who stands above rung 0.
    const [target] = rowsOf<{ id: number }>(
      await app.database.db.execute(sql`
        select p.id from pass_offs p
        join student_attainment a on a.student_id = p.student_id and a.active and a.rung > 0
        where p.passed and p.heard_on between ${now.starts_on}::date and ${day}::date
        order by p.heard_on, p.id limit 1`),
    );
    const removed = await app.clients.coordinator.delete(`/api/pass-offs/${target!.id}`);
    expect([200, 204]).toContain(removed.status);
    // The counts the figure reads follow the summary row the removal rewrote.
    expect(await rungCountDrift(app.database.db)).toEqual([]);
    const figure = yearOverYearSchema.parse(
      (await app.clients.coordinator.get(`/api/analytics/year-over-year?asOf=${day}`)).body,
    ).rungByGrade;
    const { current, previous } = await players();
    expectFigure(
      figure,
      await plainFigure(current, day),
      await plainFigure(previous, figure.previousAsOf!),
    );
  });

  it('should refuse a day outside the compared year or not a date, with the reason', async () => {
    const now = years.at(-1)!;
    const outside = await app.clients.coordinator.get(
      `/api/analytics/year-over-year?asOf=${addDays(now.ends_on, 1)}`,
    );
    expect(outside.status).toBe(400);
    expect(outside.body.error.message).toContain(now.name);
    expect(outside.body.error.fieldErrors[0]).toMatchObject({ field: 'asOf' });
    const garbled = await app.clients.coordinator.get('/api/analytics/year-over-year?asOf=soon');
    expect(garbled.status).toBe(400);
  });
});
