import { sql } from 'drizzle-orm';
import { rowsOf } from '../../server/db/client';
import type { TestApp } from '../support/test-app';

/**
 * Every route × every kind of caller, from one table. A route the app serves that has no entry
 * here fails the first test, so a new route cannot ship without its rules written down.
 *
 * Codes per caller, in the order of `staff`: P = passes the access rules (any answer but 401,
 * 403 or 404), 3 = 403, 4 = 404. Signed-out, bad-token and revoked-token callers always get 401
 * on /api routes.
 */
export const staff = [
  'coordinator',
  'directorA',
  'directorB',
  'technician',
  'viewer',
  'student',
] as const;
export type Caller = (typeof staff)[number];

export interface Fixture {
  /** The coordinator's API token, for the rows the fresh-row builders make. */
  coordinatorToken: string;
  hpms: number;
  qhms: number;
  hpmsStudent: number;
  ownStudent: number;
  hpmsEnsemble: number;
  hpmsEnrollment: number;
  hpmsInstrument: number;
  hpmsLoan: number;
  hpmsRepair: number;
  hpmsPassOff: number;
  hpmsCount: number;
  importRun: number;
  reportRun: number;
  outboxMessage: number;
  directorAToken: number;
  activeLadder: number;
  photo: number;
  sentTake: number;
}

export interface Entry {
  /** `METHOD /path` exactly as the router declares it. */
  route: string;
  codes: string;
  url?: (fixture: Fixture) => string;
  /** For deletions: a fresh row per caller, so one caller's delete doesn't change the next one's answer. */
  fresh?: (app: TestApp, fixture: Fixture) => Promise<string>;
  /** A body that passes validation, so the access rules decide (default `{}`; PATCH `{ version: 1 }`). */
  body?: (fixture: Fixture) => object;
}

/**
 * The entry of a route with one path parameter, the URL filled in from the fixture's row `key`
 * (`'GET /api/loans/:id'` with `'hpmsLoan'` asks for `/api/loans/<that loan's id>`).
 */
function onRow(route: string, codes: string, key: keyof Fixture): Entry {
  const path = route.slice(route.indexOf(' ') + 1);
  return { route, codes, url: (f) => path.replace(/:[A-Za-z]+/, String(f[key])) };
}

export const matrix: Entry[] = [
  { route: 'GET /api/me', codes: 'PPPPPP' },
  { route: 'GET /api/district', codes: 'PPPPPP' },
  { route: 'PATCH /api/district', codes: 'P33333' },
  { route: 'GET /api/schools', codes: 'PPPPP3' },
  onRow('GET /api/schools/:id', 'PP4P43', 'hpms'),
  { route: 'POST /api/schools', codes: 'P33333' },
  onRow('PATCH /api/schools/:id', 'P33333', 'hpms'),
  { route: 'DELETE /api/schools/:id', codes: 'P33333', fresh: freshSchool },
  { route: 'GET /api/school-years', codes: 'PPPPPP' },
  { route: 'POST /api/school-years', codes: 'P33333' },
  { route: 'PATCH /api/school-years/:id', codes: 'P33333', url: () => '/api/school-years/1' },
  // An empty body: the coordinator gets 400 and nothing starts.
  { route: 'POST /api/school-years/start/preview', codes: 'P33333' },
  { route: 'POST /api/school-years/start', codes: 'P33333' },
  { route: 'GET /api/backup', codes: 'P33333' },
  { route: 'GET /api/tokens', codes: 'PPPP33' },
  { route: 'POST /api/tokens', codes: 'PPPP33' },
  onRow('DELETE /api/tokens/:id', 'PP4433', 'directorAToken'),
  { route: 'GET /api/outbox', codes: 'PPP333' },
  onRow('GET /api/outbox/:id', 'PP4333', 'outboxMessage'),
  onRow('POST /api/outbox/:id/resend', 'PP4333', 'outboxMessage'),
  { route: 'GET /api/reports', codes: 'PPP3P3' },
  {
    route: 'GET /api/reports/preview',
    codes: 'PP4343',
    url: (f) =>
      `/api/reports/preview?kind=director&schoolId=${f.hpms}&from=2026-11-01&to=2026-11-30`,
  },
  {
    route: 'POST /api/reports/send',
    codes: 'PP4333',
    body: (f) => ({ kind: 'director', schoolIds: [f.hpms], from: '2026-11-01', to: '2026-11-30' }),
  },
  { route: 'GET /api/reports/schedules', codes: 'P33333' },
  { route: 'GET /api/reports/schedules/:id', codes: 'P33333', fresh: freshSchedule },
  { route: 'POST /api/reports/schedules', codes: 'P33333' },
  { route: 'PATCH /api/reports/schedules/:id', codes: 'P33333', fresh: freshSchedule },
  { route: 'DELETE /api/reports/schedules/:id', codes: 'P33333', fresh: freshSchedule },
  onRow('GET /api/reports/:id', 'PP4343', 'reportRun'),
  { route: 'POST /api/imports/preview', codes: 'P33333' },
  { route: 'POST /api/imports/commit', codes: 'P33333' },
  { route: 'GET /api/imports', codes: 'P33333' },
  { route: 'GET /api/imports/presets', codes: 'P33333' },
  { route: 'POST /api/imports/presets', codes: 'P33333' },
  { route: 'DELETE /api/imports/presets/:id', codes: 'P33333', fresh: freshPreset },
  onRow('GET /api/imports/:id', 'P33333', 'importRun'),
  onRow('GET /api/imports/:id/errors.csv', 'P33333', 'importRun'),
  onRow('GET /api/imports/:id/undo', 'P33333', 'importRun'),
  onRow('POST /api/imports/:id/undo', 'P33333', 'importRun'),
  { route: 'GET /api/oneroster/org-mappings', codes: 'P33333' },
  { route: 'PUT /api/oneroster/org-mappings', codes: 'P33333' },
  {
    route: 'DELETE /api/oneroster/org-mappings/:sourcedId',
    codes: 'P33333',
    fresh: freshOrgMapping,
  },
  { route: 'GET /api/oneroster/sync', codes: 'P33333' },
  { route: 'PUT /api/oneroster/sync', codes: 'P33333' },
  { route: 'POST /api/oneroster/sync/run', codes: 'P33333' },
  { route: 'GET /api/students', codes: 'PPP3P3' },
  onRow('GET /api/students/:id', 'PP4344', 'hpmsStudent'),
  { route: 'POST /api/students', codes: 'PPP333' },
  onRow('PATCH /api/students/:id', 'PP4333', 'hpmsStudent'),
  {
    route: 'POST /api/students/:id/move',
    codes: 'PP4333',
    url: (f) => `/api/students/${f.hpmsStudent}/move`,
    body: (f) => ({ toSchoolId: f.hpms, version: 1 }),
  },
  { route: 'GET /api/ensembles', codes: 'PPP3P3' },
  onRow('GET /api/ensembles/:id', 'PP4343', 'hpmsEnsemble'),
  { route: 'POST /api/ensembles', codes: 'PPP333' },
  onRow('PATCH /api/ensembles/:id', 'PP4333', 'hpmsEnsemble'),
  { route: 'DELETE /api/ensembles/:id', codes: 'PP4333', fresh: freshEnsemble },
  { route: 'GET /api/enrollments', codes: 'PPP3P3' },
  onRow('GET /api/enrollments/:id', 'PP4343', 'hpmsEnrollment'),
  { route: 'POST /api/enrollments', codes: 'PPP333' },
  onRow('PATCH /api/enrollments/:id', 'PP4333', 'hpmsEnrollment'),
  { route: 'DELETE /api/enrollments/:id', codes: 'PP4333', fresh: freshEnrollment },
  {
    route: 'GET /api/grid-preferences/:grid',
    codes: 'PPPPPP',
    url: () => '/api/grid-preferences/students',
  },
  {
    route: 'PUT /api/grid-preferences/:grid',
    codes: 'PPPPPP',
    url: () => '/api/grid-preferences/students',
  },
  {
    route: 'DELETE /api/grid-preferences/:grid',
    codes: 'PPPPPP',
    url: () => '/api/grid-preferences/students',
  },
  { route: 'GET /api/ladder', codes: 'PPPPPP' },
  { route: 'GET /api/ladder/versions', codes: 'PPPPPP' },
  onRow('GET /api/ladder/versions/:id', 'PPPPPP', 'activeLadder'),
  { route: 'POST /api/ladder/versions', codes: 'P33333' },
  onRow('PATCH /api/ladder/versions/:id', 'P33333', 'activeLadder'),
  { route: 'DELETE /api/ladder/versions/:id', codes: 'P33333', fresh: freshLadderDraft },
  {
    route: 'GET /api/ladder/versions/:id/impact',
    codes: 'P33333',
    fresh: async (app, fixture) => `${await freshLadderDraft(app, fixture)}/impact`,
  },
  {
    route: 'GET /api/ladder/versions/:id/impact/students',
    codes: 'P33333',
    fresh: async (app, fixture) =>
      `${await freshLadderDraft(app, fixture)}/impact/students?move=down`,
  },
  {
    route: 'POST /api/ladder/versions/:id/publish',
    codes: 'P33333',
    fresh: async (app, fixture) => `${await freshLadderDraft(app, fixture)}/publish`,
  },
  {
    route: 'POST /api/ladder/versions/:id/restore',
    codes: 'P33333',
    fresh: async (app, fixture) => `${await freshLadderDraft(app, fixture)}/restore`,
  },
  { route: 'POST /api/ladder/attainment/rebuild', codes: 'P33333' },
  { route: 'GET /api/pass-offs', codes: 'PPP3PP' },
  onRow('GET /api/pass-offs/:id', 'PP4344', 'hpmsPassOff'),
  { route: 'POST /api/pass-offs', codes: 'PPP333' },
  onRow('PATCH /api/pass-offs/:id', 'PP4333', 'hpmsPassOff'),
  { route: 'DELETE /api/pass-offs/:id', codes: 'PP4333', fresh: freshPassOff },
  onRow('POST /api/pass-offs/:id/recording', 'PP4333', 'hpmsPassOff'),
  onRow('GET /api/pass-offs/:id/recording', 'PP4344', 'hpmsPassOff'),
  { route: 'GET /api/takes', codes: 'PPP33P' },
  { route: 'POST /api/takes', codes: '33333P' },
  { route: 'POST /api/takes/heard', codes: 'PPP333' },
  onRow('POST /api/takes/:id/send', '33333P', 'sentTake'),
  onRow('GET /api/takes/:id/recording', 'PP433P', 'sentTake'),
  { route: 'GET /api/settings/take-retention', codes: 'P33333' },
  {
    route: 'PUT /api/settings/take-retention',
    codes: 'P33333',
    body: () => ({ keep: 'school-year' }),
  },
  { route: 'GET /api/analytics/overview', codes: 'PPP3P3' },
  { route: 'GET /api/analytics/students', codes: 'PPP3P3' },
  { route: 'GET /api/analytics/audition-ready', codes: 'PPP3P3' },
  { route: 'GET /api/analytics/year-over-year', codes: 'PPP3P3' },
  { route: 'GET /api/analytics/retention/students', codes: 'PPP3P3' },
  onRow('GET /api/analytics/students/:id/progress', 'PP4344', 'hpmsStudent'),
  { route: 'GET /api/instruments', codes: 'PPPPP3' },
  {
    route: 'GET /api/instruments/labels.pdf',
    codes: 'PP4P43',
    url: (f) => `/api/instruments/labels.pdf?schoolId=${f.hpms}`,
  },
  { route: 'POST /api/instruments/import', codes: 'P33P33' },
  onRow('GET /api/instruments/:id', 'PP4P43', 'hpmsInstrument'),
  { route: 'POST /api/instruments', codes: 'P33P33' },
  onRow('PATCH /api/instruments/:id', 'P33P33', 'hpmsInstrument'),
  onRow('POST /api/instruments/:id/cleaned', 'P33P33', 'hpmsInstrument'),
  onRow('POST /api/instruments/:id/photos', 'P33P33', 'hpmsInstrument'),
  {
    route: 'GET /api/instruments/:id/photos/:photoId',
    codes: 'PP4P43',
    url: (f) => `/api/instruments/${f.hpmsInstrument}/photos/${f.photo}`,
  },
  { route: 'GET /api/loans', codes: 'PPPPPP' },
  { route: 'GET /api/loans/agreement-text', codes: 'PPPPP3' },
  { route: 'PUT /api/loans/agreement-text', codes: 'P33333' },
  { route: 'POST /api/loans/overdue-reminders', codes: 'PPP333' },
  { route: 'POST /api/loans', codes: 'PPP333' },
  onRow('GET /api/loans/:id', 'PP4P44', 'hpmsLoan'),
  onRow('GET /api/loans/:id/agreement.pdf', 'PP4P44', 'hpmsLoan'),
  onRow('POST /api/loans/:id/return', 'PP4P33', 'hpmsLoan'),
  onRow('POST /api/loans/:id/reminder', 'PP4333', 'hpmsLoan'),
  onRow('POST /api/loans/:id/agreement-link', 'PP4333', 'hpmsLoan'),
  { route: 'GET /api/fees/schedule', codes: 'PPPPP3' },
  { route: 'PUT /api/fees/schedule', codes: 'P33333' },
  { route: 'GET /api/fees', codes: 'PPPPP3' },
  { route: 'GET /api/fees/summary', codes: 'PPPPP3' },
  { route: 'GET /api/fees/reconciliation', codes: 'P33333' },
  { route: 'GET /api/fees/export.csv', codes: 'PPPPP3' },
  { route: 'GET /api/fees/export.xlsx', codes: 'PPPPP3' },
  {
    route: 'GET /api/fees/quote',
    codes: 'PP4333',
    url: (f) => `/api/fees/quote?instrumentId=${f.hpmsInstrument}&studentId=${f.hpmsStudent}`,
  },
  onRow('GET /api/fees/:loanId', 'PP4333', 'hpmsLoan'),
  onRow('POST /api/fees/:loanId/refunds', 'P33333', 'hpmsLoan'),
  onRow('POST /api/fees/:loanId/payments', 'P33333', 'hpmsLoan'),
  onRow('POST /api/fees/:loanId/reminder', 'PP4333', 'hpmsLoan'),
  { route: 'GET /api/repairs', codes: 'PPPPP3' },
  onRow('GET /api/repairs/:id', 'PP4P43', 'hpmsRepair'),
  { route: 'POST /api/repairs', codes: 'P33P33' },
  onRow('PATCH /api/repairs/:id', 'P33P33', 'hpmsRepair'),
  { route: 'GET /api/counts', codes: 'PPPPP3' },
  { route: 'POST /api/counts', codes: 'PPPP33' },
  onRow('GET /api/counts/:id', 'PP4P43', 'hpmsCount'),
  {
    route: 'POST /api/counts/:id/scans',
    codes: 'PP4P33',
    url: (f) => `/api/counts/${f.hpmsCount}/scans`,
    body: () => ({ assetTag: 'MB-NOT-A-TAG' }),
  },
  onRow('POST /api/counts/:id/close', 'PP4P33', 'hpmsCount'),
  { route: 'GET /api/planning/replacement', codes: 'PPPPP3' },
  { route: 'GET /api/planning/shortages', codes: 'PPPPP3' },
  { route: 'GET /api/users', codes: 'P33333' },
  { route: 'GET /api/users/:id', codes: 'P33333', url: () => '/api/users/1' },
  { route: 'POST /api/users', codes: 'P33333' },
  { route: 'PATCH /api/users/:id', codes: 'P33333', url: () => '/api/users/2' },
  { route: 'GET /api/audit', codes: 'P33333' },
];

/** Routes outside /api with their own rules, checked by their own suites. */
export const outsideApi = new Set([
  'GET /auth/sign-in',
  'GET /auth/callback',
  'POST /auth/sign-out',
  'GET /agreements/:token',
  'POST /agreements/:token',
  // The district's name and logo: public, for the pages shown before sign-in.
  'GET /district-brand',
  'GET /district-logo',
  // Signed by the payment service, not by a user: tests/api/payments-hosted-page.test.ts.
  'POST /api/payments/webhook',
  'GET /pay/:token',
  'POST /pay/:token',
  'GET /pay/:token/done',
]);

async function freshSchool(app: TestApp, fixture: Fixture): Promise<string> {
  const code = `T${Math.floor(Math.random() * 1e6)}`.slice(0, 8);
  const response = await app
    .bearer(fixture.coordinatorToken)
    .post('/api/schools', { code, name: `Matrix School ${code}`, level: 'other' });
  return `/api/schools/${response.body.id}`;
}
async function freshSchedule(app: TestApp): Promise<string> {
  const [row] = rowsOf<{ id: number }>(
    await app.database.db.execute(
      sql`insert into report_schedules (kind, cron, time_zone, target, next_run_at, active) values ('district', '0 7 * * 1', 'America/Los_Angeles', '{}'::jsonb, now() + interval '1 day', false) returning id`,
    ),
  );
  return `/api/reports/schedules/${row!.id}`;
}
async function freshOrgMapping(app: TestApp, fixture: Fixture): Promise<string> {
  const sourcedId = `matrix-org-${Math.random().toString(36).slice(2)}`;
  await app.database.db.execute(
    sql`insert into oneroster_org_schools (sourced_id, org_name, school_id) values (${sourcedId}, 'Matrix Campus', ${fixture.hpms})`,
  );
  return `/api/oneroster/org-mappings/${sourcedId}`;
}
async function freshPreset(app: TestApp): Promise<string> {
  const [row] = rowsOf<{ id: number }>(
    await app.database.db.execute(
      sql`insert into import_presets (name, kind, mapping) values (${`matrix ${Math.random()}`}, 'roster', '{}'::jsonb) returning id`,
    ),
  );
  return `/api/imports/presets/${row!.id}`;
}
async function freshEnsemble(app: TestApp, fixture: Fixture): Promise<string> {
  const [row] = rowsOf<{ id: number }>(
    await app.database.db.execute(
      sql`insert into ensembles (school_id, name, kind) values (${fixture.hpms}, ${`Matrix Ensemble ${Math.random()}`}, 'jazz-band') returning id`,
    ),
  );
  return `/api/ensembles/${row!.id}`;
}
async function freshEnrollment(app: TestApp, fixture: Fixture): Promise<string> {
  const [row] = rowsOf<{ id: number }>(
    await app.database.db.execute(
      sql`insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id) select ${fixture.hpmsStudent}, e.id, (select id from school_years where current), 'flute' from ensembles e where e.school_id = ${fixture.hpms} and not exists (select 1 from enrollments x where x.student_id = ${fixture.hpmsStudent} and x.ensemble_id = e.id) limit 1 returning id`,
    ),
  );
  if (!row) {
    const ensemble = await freshEnsemble(app, fixture);
    const id = Number(ensemble.split('/').at(-1));
    const [seat] = rowsOf<{ id: number }>(
      await app.database.db.execute(
        sql`insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id) values (${fixture.hpmsStudent}, ${id}, (select id from school_years where current), 'flute') returning id`,
      ),
    );
    return `/api/enrollments/${seat!.id}`;
  }
  return `/api/enrollments/${row.id}`;
}
async function freshPassOff(app: TestApp, fixture: Fixture): Promise<string> {
  const ladder = await app.bearer(fixture.coordinatorToken).get('/api/ladder');
  const requirement = ladder.body.rungs[0].requirements[0];
  const response = await app.bearer(fixture.coordinatorToken).post('/api/pass-offs', {
    studentId: fixture.hpmsStudent,
    requirementCode: requirement.code,
    heardOn: '2026-11-30',
    tempo: requirement.tempo,
    passed: false,
  });
  const id = response.body.id ?? response.body.rows?.[0]?.id;
  if (!id)
    throw new Error(
      `Could not make a pass-off: ${response.status} ${JSON.stringify(response.body)}`,
    );
  return `/api/pass-offs/${id}`;
}
async function freshLadderDraft(app: TestApp, fixture: Fixture): Promise<string> {
  const response = await app.bearer(fixture.coordinatorToken).post('/api/ladder/versions', {});
  return `/api/ladder/versions/${response.body.id}`;
}
