import { sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { rowsOf } from '../db/client';
import type { ShortageReport } from '@shared/api/planning';
import { inScope, type Actor } from '../core/policy';
import { instrumentNameOf } from '../instruments/instrument-cautions';

/**
 * The instruments the district, not the family, provides: large or costly ones few families buy
 * (common practice, no source). A euphonium read in treble clef is the same instrument.
 */
export const districtProvidedInstruments = [
  'tuba',
  'euphonium',
  'horn',
  'bassoon',
  'bari-sax',
  'bass-clarinet',
  'cello',
  'double-bass',
  'oboe',
  'marimba',
  'xylophone',
] as const;

const kind = (column: string) =>
  sql.raw(`case when ${column} = 'euphonium-tc' then 'euphonium' else ${column} end`);
const provided = sql.raw(districtProvidedInstruments.map((id) => `'${id}'`).join(', '));

interface Figures {
  players: number;
  onLoan: number;
  available: number;
  availableTags: string[];
}

/** One school's figures per instrument kind, from the three counts below. */
async function figures(db: Database) {
  const [players, loaned, available, schoolRows] = await Promise.all([
    db.execute(sql`select s.school_id, ${kind('e.instrument_id')} as kind, count(distinct s.id)::int as n
      from enrollments e join students s on s.id = e.student_id join school_years y on y.id = e.school_year_id
      where y.current and e.active and s.status = 'active' and ${kind('e.instrument_id')} in (${provided})
      group by 1, 2`),
    db.execute(sql`select l.school_id, ${kind('i.instrument_id')} as kind, count(distinct l.student_id)::int as n
      from loans l join instruments i on i.id = l.instrument_id
      where l.state = 'active' and ${kind('i.instrument_id')} in (${provided})
      group by 1, 2`),
    db.execute(sql`select i.home_school_id as school_id, ${kind('i.instrument_id')} as kind,
        array_agg(i.asset_tag order by array_position(array['excellent','good','fair','poor','unserviceable'], i.condition), i.asset_tag) as tags
      from instruments i where i.status = 'available' and ${kind('i.instrument_id')} in (${provided})
      group by 1, 2`),
    db.execute(sql`select id, code, name from schools order by code`),
  ]);
  const table = new Map<string, Figures>();
  const entry = (schoolId: number, instrumentId: string) => {
    const key = `${schoolId}:${instrumentId}`;
    if (!table.has(key)) table.set(key, { players: 0, onLoan: 0, available: 0, availableTags: [] });
    return table.get(key)!;
  };
  for (const row of rowsOf<{ school_id: number; kind: string; n: number }>(players))
    entry(row.school_id, row.kind).players = row.n;
  for (const row of rowsOf<{ school_id: number; kind: string; n: number }>(loaned))
    entry(row.school_id, row.kind).onLoan = row.n;
  for (const row of rowsOf<{ school_id: number; kind: string; tags: string[] }>(available)) {
    const figure = entry(row.school_id, row.kind);
    figure.available = row.tags.length;
    figure.availableTags = row.tags;
  }
  return { table, schools: rowsOf<{ id: number; code: string; name: string }>(schoolRows) };
}

/**
 * Per school, the district-provided instruments its enrolled players need against those ready
 * to lend there, and transfers from schools with spares: a player needs one unless they already
 * hold a loan of that kind. Transfers go greedily to the largest shortfall from the largest
 * surplus, best-condition instruments first.
 */
export async function shortageReport(db: Database, actor: Actor): Promise<ShortageReport> {
  const { table, schools } = await figures(db);
  const lines = schools.map((school) => ({
    schoolId: school.id,
    schoolCode: school.code,
    schoolName: school.name,
    lines: districtProvidedInstruments.flatMap((instrumentId) => {
      const figure = table.get(`${school.id}:${instrumentId}`);
      if (!figure) return [];
      const onLoan = Math.min(figure.onLoan, figure.players);
      const need = figure.players - onLoan;
      return [
        {
          instrumentId,
          instrumentName: instrumentNameOf(instrumentId),
          players: figure.players,
          onLoan,
          available: figure.available,
          shortfall: Math.max(0, need - figure.available),
          surplus: Math.max(0, figure.available - need),
        },
      ];
    }),
  }));
  const transfers: ShortageReport['transfers'] = [];
  for (const instrumentId of districtProvidedInstruments) {
    const wanting = lines.flatMap((school) =>
      school.lines
        .filter((line) => line.instrumentId === instrumentId && line.shortfall > 0)
        .map((line) => ({ school, left: line.shortfall })),
    );
    const giving = lines.flatMap((school) =>
      school.lines
        .filter((line) => line.instrumentId === instrumentId && line.surplus > 0)
        .map((line) => ({
          school,
          left: line.surplus,
          tags: table
            .get(`${school.schoolId}:${instrumentId}`)!
            .availableTags.slice(0, line.surplus),
        })),
    );
    wanting.sort(
      (a, b) => b.left - a.left || a.school.schoolCode.localeCompare(b.school.schoolCode),
    );
    for (const want of wanting) {
      giving.sort(
        (a, b) => b.left - a.left || a.school.schoolCode.localeCompare(b.school.schoolCode),
      );
      for (const give of giving) {
        if (want.left === 0) break;
        if (give.left === 0) continue;
        const moved = Math.min(want.left, give.left);
        transfers.push({
          instrumentId,
          instrumentName: instrumentNameOf(instrumentId),
          fromSchoolId: give.school.schoolId,
          fromSchoolCode: give.school.schoolCode,
          toSchoolId: want.school.schoolId,
          toSchoolCode: want.school.schoolCode,
          count: moved,
          assetTags: give.tags.splice(0, moved),
        });
        want.left -= moved;
        give.left -= moved;
      }
    }
  }
  return {
    districtProvided: [...districtProvidedInstruments],
    schools: lines.filter((school) => inScope(actor, school.schoolId) && school.lines.length > 0),
    transfers: transfers.filter(
      (transfer) => inScope(actor, transfer.fromSchoolId) || inScope(actor, transfer.toSchoolId),
    ),
  };
}
