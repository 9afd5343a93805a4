import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { sql } from 'drizzle-orm';
import { createApp } from '../../server/app';
import { rowsOf } from '../../server/db/client';
import { createLogger } from '../../server/logger';
import { writeRecordingFile } from '../../server/pass-offs/recordings-store';
import { hashToken } from '../../server/tokens/tokens-service';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

/**
 * Every route × every kind of caller, from one table. A route the app serves that has no entry
 * here fails the first test, so a new route cannot ship without its rules written down.
 *
 * Codes per caller, in the order of `staff`: P = passes the access rules (any answer but 401,
 * 403 or 404), 3 = 403, 4 = 404. Signed-out, bad-token and revoked-token callers always get 401
 * on /api routes.
 */
const staff = ['coordinator', 'directorA', 'directorB', 'technician', 'viewer', 'student'] as const;
type Caller = (typeof staff)[number];

interface Fixture {
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

interface Entry {
  /** `METHOD /path` exactly as the router declares it. */
  route: string;
  codes: string;
  url?: (fixture: Fixture) => string;
  /** For deletions: a fresh row per caller, so one caller's delete doesn't change the next one's answer. */
  fresh?: (app: TestApp, fixture: Fixture) => Promise<string>;
  /** A body that passes validation, so the access rules decide (default `{}`; PATCH `{ version: 1 }`). */
  body?: (fixture: Fixture) => object;
}

const matrix: Entry[] = [
  { route: 'GET /api/me', codes: 'PPPPPP' },
  { route: 'GET /api/district', codes: 'PPPPPP' },
  { route: 'PATCH /api/district', codes: 'P33333' },
  { route: 'GET /api/schools', codes: 'PPPPP3' },
  { route: 'GET /api/schools/:id', codes: 'PP4P43', url: (f) => `/api/schools/${f.hpms}` },
  { route: 'POST /api/schools', codes: 'P33333' },
  { route: 'PATCH /api/schools/:id', codes: 'P33333', url: (f) => `/api/schools/${f.hpms}` },
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
  {
    route: 'DELETE /api/tokens/:id',
    codes: 'PP4433',
    url: (f) => `/api/tokens/${f.directorAToken}`,
  },
  { route: 'GET /api/outbox', codes: 'PPP333' },
  { route: 'GET /api/outbox/:id', codes: 'PP4333', url: (f) => `/api/outbox/${f.outboxMessage}` },
  {
    route: 'POST /api/outbox/:id/resend',
    codes: 'PP4333',
    url: (f) => `/api/outbox/${f.outboxMessage}/resend`,
  },
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
  { route: 'GET /api/reports/:id', codes: 'PP4343', url: (f) => `/api/reports/${f.reportRun}` },
  { route: 'POST /api/imports/preview', codes: 'P33333' },
  { route: 'POST /api/imports/commit', codes: 'P33333' },
  { route: 'GET /api/imports', codes: 'P33333' },
  { route: 'GET /api/imports/presets', codes: 'P33333' },
  { route: 'POST /api/imports/presets', codes: 'P33333' },
  { route: 'DELETE /api/imports/presets/:id', codes: 'P33333', fresh: freshPreset },
  { route: 'GET /api/imports/:id', codes: 'P33333', url: (f) => `/api/imports/${f.importRun}` },
  {
    route: 'GET /api/imports/:id/errors.csv',
    codes: 'P33333',
    url: (f) => `/api/imports/${f.importRun}/errors.csv`,
  },
  {
    route: 'GET /api/imports/:id/undo',
    codes: 'P33333',
    url: (f) => `/api/imports/${f.importRun}/undo`,
  },
  {
    route: 'POST /api/imports/:id/undo',
    codes: 'P33333',
    url: (f) => `/api/imports/${f.importRun}/undo`,
  },
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
  { route: 'GET /api/students/:id', codes: 'PP4344', url: (f) => `/api/students/${f.hpmsStudent}` },
  { route: 'POST /api/students', codes: 'PPP333' },
  {
    route: 'PATCH /api/students/:id',
    codes: 'PP4333',
    url: (f) => `/api/students/${f.hpmsStudent}`,
  },
  {
    route: 'POST /api/students/:id/move',
    codes: 'PP4333',
    url: (f) => `/api/students/${f.hpmsStudent}/move`,
    body: (f) => ({ toSchoolId: f.hpms, version: 1 }),
  },
  { route: 'GET /api/ensembles', codes: 'PPP3P3' },
  {
    route: 'GET /api/ensembles/:id',
    codes: 'PP4343',
    url: (f) => `/api/ensembles/${f.hpmsEnsemble}`,
  },
  { route: 'POST /api/ensembles', codes: 'PPP333' },
  {
    route: 'PATCH /api/ensembles/:id',
    codes: 'PP4333',
    url: (f) => `/api/ensembles/${f.hpmsEnsemble}`,
  },
  { route: 'DELETE /api/ensembles/:id', codes: 'PP4333', fresh: freshEnsemble },
  { route: 'GET /api/enrollments', codes: 'PPP3P3' },
  {
    route: 'GET /api/enrollments/:id',
    codes: 'PP4343',
    url: (f) => `/api/enrollments/${f.hpmsEnrollment}`,
  },
  { route: 'POST /api/enrollments', codes: 'PPP333' },
  {
    route: 'PATCH /api/enrollments/:id',
    codes: 'PP4333',
    url: (f) => `/api/enrollments/${f.hpmsEnrollment}`,
  },
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
  {
    route: 'GET /api/ladder/versions/:id',
    codes: 'PPPPPP',
    url: (f) => `/api/ladder/versions/${f.activeLadder}`,
  },
  { route: 'POST /api/ladder/versions', codes: 'P33333' },
  {
    route: 'PATCH /api/ladder/versions/:id',
    codes: 'P33333',
    url: (f) => `/api/ladder/versions/${f.activeLadder}`,
  },
  { route: 'DELETE /api/ladder/versions/:id', codes: 'P33333', fresh: freshLadderDraft },
  {
    route: 'GET /api/ladder/versions/:id/impact',
    codes: 'P33333',
    fresh: async (app) => `${await freshLadderDraft(app)}/impact`,
  },
  {
    route: 'GET /api/ladder/versions/:id/impact/students',
    codes: 'P33333',
    fresh: async (app) => `${await freshLadderDraft(app)}/impact/students?move=down`,
  },
  {
    route: 'POST /api/ladder/versions/:id/publish',
    codes: 'P33333',
    fresh: async (app) => `${await freshLadderDraft(app)}/publish`,
  },
  {
    route: 'POST /api/ladder/versions/:id/restore',
    codes: 'P33333',
    fresh: async (app) => `${await freshLadderDraft(app)}/restore`,
  },
  { route: 'POST /api/ladder/attainment/rebuild', codes: 'P33333' },
  { route: 'GET /api/pass-offs', codes: 'PPP3PP' },
  {
    route: 'GET /api/pass-offs/:id',
    codes: 'PP4344',
    url: (f) => `/api/pass-offs/${f.hpmsPassOff}`,
  },
  { route: 'POST /api/pass-offs', codes: 'PPP333' },
  {
    route: 'PATCH /api/pass-offs/:id',
    codes: 'PP4333',
    url: (f) => `/api/pass-offs/${f.hpmsPassOff}`,
  },
  { route: 'DELETE /api/pass-offs/:id', codes: 'PP4333', fresh: freshPassOff },
  {
    route: 'POST /api/pass-offs/:id/recording',
    codes: 'PP4333',
    url: (f) => `/api/pass-offs/${f.hpmsPassOff}/recording`,
  },
  {
    route: 'GET /api/pass-offs/:id/recording',
    codes: 'PP4344',
    url: (f) => `/api/pass-offs/${f.hpmsPassOff}/recording`,
  },
  { route: 'GET /api/takes', codes: 'PPP33P' },
  { route: 'POST /api/takes', codes: '33333P' },
  { route: 'POST /api/takes/heard', codes: 'PPP333' },
  {
    route: 'POST /api/takes/:id/send',
    codes: '33333P',
    url: (f) => `/api/takes/${f.sentTake}/send`,
  },
  {
    route: 'GET /api/takes/:id/recording',
    codes: 'PP433P',
    url: (f) => `/api/takes/${f.sentTake}/recording`,
  },
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
  {
    route: 'GET /api/analytics/students/:id/progress',
    codes: 'PP4344',
    url: (f) => `/api/analytics/students/${f.hpmsStudent}/progress`,
  },
  { route: 'GET /api/instruments', codes: 'PPPPP3' },
  {
    route: 'GET /api/instruments/labels.pdf',
    codes: 'PP4P43',
    url: (f) => `/api/instruments/labels.pdf?schoolId=${f.hpms}`,
  },
  { route: 'POST /api/instruments/import', codes: 'P33P33' },
  {
    route: 'GET /api/instruments/:id',
    codes: 'PP4P43',
    url: (f) => `/api/instruments/${f.hpmsInstrument}`,
  },
  { route: 'POST /api/instruments', codes: 'P33P33' },
  {
    route: 'PATCH /api/instruments/:id',
    codes: 'P33P33',
    url: (f) => `/api/instruments/${f.hpmsInstrument}`,
  },
  {
    route: 'POST /api/instruments/:id/cleaned',
    codes: 'P33P33',
    url: (f) => `/api/instruments/${f.hpmsInstrument}/cleaned`,
  },
  {
    route: 'POST /api/instruments/:id/photos',
    codes: 'P33P33',
    url: (f) => `/api/instruments/${f.hpmsInstrument}/photos`,
  },
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
  { route: 'GET /api/loans/:id', codes: 'PP4P44', url: (f) => `/api/loans/${f.hpmsLoan}` },
  {
    route: 'GET /api/loans/:id/agreement.pdf',
    codes: 'PP4P44',
    url: (f) => `/api/loans/${f.hpmsLoan}/agreement.pdf`,
  },
  {
    route: 'POST /api/loans/:id/return',
    codes: 'PP4P33',
    url: (f) => `/api/loans/${f.hpmsLoan}/return`,
  },
  {
    route: 'POST /api/loans/:id/reminder',
    codes: 'PP4333',
    url: (f) => `/api/loans/${f.hpmsLoan}/reminder`,
  },
  {
    route: 'POST /api/loans/:id/agreement-link',
    codes: 'PP4333',
    url: (f) => `/api/loans/${f.hpmsLoan}/agreement-link`,
  },
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
  { route: 'GET /api/fees/:loanId', codes: 'PP4333', url: (f) => `/api/fees/${f.hpmsLoan}` },
  {
    route: 'POST /api/fees/:loanId/refunds',
    codes: 'P33333',
    url: (f) => `/api/fees/${f.hpmsLoan}/refunds`,
  },
  {
    route: 'POST /api/fees/:loanId/payments',
    codes: 'P33333',
    url: (f) => `/api/fees/${f.hpmsLoan}/payments`,
  },
  {
    route: 'POST /api/fees/:loanId/reminder',
    codes: 'PP4333',
    url: (f) => `/api/fees/${f.hpmsLoan}/reminder`,
  },
  { route: 'GET /api/repairs', codes: 'PPPPP3' },
  { route: 'GET /api/repairs/:id', codes: 'PP4P43', url: (f) => `/api/repairs/${f.hpmsRepair}` },
  { route: 'POST /api/repairs', codes: 'P33P33' },
  { route: 'PATCH /api/repairs/:id', codes: 'P33P33', url: (f) => `/api/repairs/${f.hpmsRepair}` },
  { route: 'GET /api/counts', codes: 'PPPPP3' },
  { route: 'POST /api/counts', codes: 'PPPP33' },
  { route: 'GET /api/counts/:id', codes: 'PP4P43', url: (f) => `/api/counts/${f.hpmsCount}` },
  {
    route: 'POST /api/counts/:id/scans',
    codes: 'PP4P33',
    url: (f) => `/api/counts/${f.hpmsCount}/scans`,
    body: () => ({ assetTag: 'MB-NOT-A-TAG' }),
  },
  {
    route: 'POST /api/counts/:id/close',
    codes: 'PP4P33',
    url: (f) => `/api/counts/${f.hpmsCount}/close`,
  },
  { route: 'GET /api/planning/replacement', codes: 'PPPPP3' },
  { route: 'GET /api/planning/shortages', codes: 'PPPPP3' },
  { route: 'GET /api/users', codes: 'P33333' },
  { route: 'GET /api/users/:id', codes: 'P33333', url: () => '/api/users/1' },
  { route: 'POST /api/users', codes: 'P33333' },
  { route: 'PATCH /api/users/:id', codes: 'P33333', url: () => '/api/users/2' },
  { route: 'GET /api/audit', codes: 'P33333' },
];

/** Routes outside /api with their own rules, checked by their own suites. */
const outsideApi = new Set([
  'GET /auth/sign-in',
  'GET /auth/callback',
  'POST /auth/sign-out',
  'GET /agreements/:token',
  'POST /agreements/:token',
  // The district's name and logo: public, for the pages shown before sign-in.
  'GET /district-brand',
  'GET /district-logo',
  // Signed by the payment service, not by a user: tests/api/payments.test.ts.
  'POST /api/payments/webhook',
  'GET /pay/:token',
  'POST /pay/:token',
  'GET /pay/:token/done',
]);

async function freshSchool(app: TestApp): Promise<string> {
  const code = `T${Math.floor(Math.random() * 1e6)}`.slice(0, 8);
  const response = await app
    .bearer(coordinatorToken)
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
  const ladder = await app.bearer(coordinatorToken).get('/api/ladder');
  const requirement = ladder.body.rungs[0].requirements[0];
  const response = await app.bearer(coordinatorToken).post('/api/pass-offs', {
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
async function freshLadderDraft(app: TestApp): Promise<string> {
  const response = await app.bearer(coordinatorToken).post('/api/ladder/versions', {});
  return `/api/ladder/versions/${response.body.id}`;
}

/** Every route the app declares, as `METHOD /path`. */
function declaredRoutes(app: Express): string[] {
  const found: string[] = [];
  type Layer = {
    route?: { path: string; methods: Record<string, boolean> };
    handle?: { stack?: Layer[] };
    matchers?: ((path: string) => unknown)[];
  };
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods))
          found.push(`${method.toUpperCase()} ${prefix}${layer.route.path}`);
      } else if (layer.handle?.stack) {
        const mountedAtApi =
          Boolean(layer.matchers?.[0]?.('/api/probe')) && !layer.matchers?.[0]?.('/probe');
        walk(layer.handle.stack, mountedAtApi ? `${prefix}/api` : prefix);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return found;
}

let app: TestApp;
let coordinatorToken: string;
let fixture: Fixture;
const tokens = {} as Record<Caller, string>;
let revokedToken: string;

const one = async (query: ReturnType<typeof sql>) =>
  rowsOf<{ id: number }>(await app.database.db.execute(query))[0]!.id;

beforeAll(async () => {
  // Thousands of deliberate bad-token calls: the failure limit would answer 429 instead of 401.
  app = await startTestApp({
    environment: { RATE_LIMIT_TOKEN_FAILURES: '100000', RATE_LIMIT_TOKEN: '100000' },
  });
  const emails: Record<Caller, string> = {
    coordinator: demoEmail('coordinator'),
    directorA: demoEmail('director.hpms'),
    directorB: demoEmail('director.qhms'),
    technician: demoEmail('technician'),
    viewer: demoEmail('viewer.trhs'),
    student: demoEmail('student.hpms'),
  };
  for (const caller of staff) tokens[caller] = await app.token(emails[caller]);
  coordinatorToken = tokens.coordinator;
  revokedToken = await app.token(demoEmail('coordinator'));
  await app.database.db.execute(
    sql`update api_tokens set revoked_at = now() where token_hash = ${hashToken(revokedToken)}`,
  );
  const hpms = await one(sql`select id from schools where code = 'HPMS'`);
  const ownStudent = await one(
    sql`select student_id as id from users where email = ${emails.student}`,
  );
  const hpmsStudent = await one(
    sql`select id from students where school_id = ${hpms} and id <> ${ownStudent} and status = 'active' order by id limit 1`,
  );
  const hpmsInstrument = await one(
    sql`select id from instruments where home_school_id = ${hpms} order by id limit 1`,
  );
  const hpmsLoan = await one(
    sql`select l.id from loans l join students s on s.id = l.student_id where s.school_id = ${hpms} and s.id <> ${ownStudent} order by l.id limit 1`,
  );
  // A real upload of each kind, so the file routes have something to answer with.
  const png = Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    Buffer.alloc(64),
  ]);
  const photoUpload = await app.anonymous
    .post(`/api/instruments/${hpmsInstrument}/photos`)
    .set('Authorization', `Bearer ${tokens.coordinator}`)
    .attach('photo', png, 'label.png');
  const photo = photoUpload.body.id ?? photoUpload.body.photos?.at(-1)?.id;
  if (!photo)
    throw new Error(
      `Photo upload failed: ${photoUpload.status} ${JSON.stringify(photoUpload.body).slice(0, 200)}`,
    );
  const hpmsPassOff = await one(
    sql`select p.id from pass_offs p join students s on s.id = p.student_id where s.school_id = ${hpms} and s.id <> ${ownStudent} order by p.id limit 1`,
  );
  const wav = Buffer.concat([
    Buffer.from('RIFF'),
    Buffer.from([36, 0, 0, 0]),
    Buffer.from('WAVEfmt '),
    Buffer.alloc(64),
  ]);
  const recording = await app.anonymous
    .post(`/api/pass-offs/${hpmsPassOff}/recording`)
    .set('Authorization', `Bearer ${tokens.coordinator}`)
    .attach('recording', wav, 'take.wav');
  if (recording.status >= 300)
    throw new Error(
      `Recording upload failed: ${recording.status} ${JSON.stringify(recording.body).slice(0, 200)}`,
    );
  fixture = {
    hpms,
    qhms: await one(sql`select id from schools where code = 'QHMS'`),
    hpmsStudent,
    ownStudent,
    hpmsEnsemble: await one(
      sql`select id from ensembles where school_id = ${hpms} order by id limit 1`,
    ),
    hpmsEnrollment: await one(
      sql`select e.id from enrollments e where e.student_id = ${hpmsStudent} order by id limit 1`,
    ),
    hpmsInstrument,
    hpmsLoan,
    hpmsRepair: await one(
      sql`insert into repair_tickets (instrument_id, problem, status) values (${hpmsInstrument}, 'Sticky valve (matrix)', 'closed') returning id`,
    ),
    hpmsPassOff,
    hpmsCount: await one(
      sql`insert into counts (school_id, state) values (${hpms}, 'closed') returning id`,
    ),
    importRun: await one(
      sql`insert into roster_imports (file_name, source, via, committed, rows, created, updated, unchanged, withdrawn) values ('matrix.csv', 'csv', 'cli', false, 0, 0, 0, 0, 0) returning id`,
    ),
    reportRun: await one(
      sql`insert into report_runs (kind, school_id, period_from, period_to, figures) values ('director', ${hpms}, '2026-11-01', '2026-11-30', '{}'::jsonb) returning id`,
    ),
    outboxMessage: await one(
      sql`insert into outbox_messages (kind, "to", subject, text, school_id) values ('other', array['director.hpms@merrowbasin.example'], 'Matrix', 'Matrix', ${hpms}) returning id`,
    ),
    directorAToken: (
      await app
        .bearer(tokens.directorA)
        .post('/api/tokens', { label: 'matrix: revoked by the test' })
    ).body.id,
    activeLadder: await one(
      sql`select id from ladder_versions where status = 'published' order by id desc limit 1`,
    ),
    photo,
    // A take the student sent, with its file, so the take routes have something to answer with.
    sentTake: await one(
      sql`insert into takes (student_id, requirement_id, tempo_asked, stored_name, content_type, size, analysis, status, sent_at) values (${ownStudent}, 'r1-eb-major', 60, ${writeRecordingFile(app.config.dataDir, wav)}, 'audio/wav', ${wav.length}, '{}'::jsonb, 'sent', now()) returning id`,
    ),
  };
});
afterAll(() => app?.close());

describe('Authorization matrix', () => {
  it('should have an entry for every route the app serves', async () => {
    const probe = await createApp(app.config, {
      database: app.database,
      logger: createLogger('silent'),
      serveWeb: false,
    });
    const declared = declaredRoutes(probe).filter((route) => !outsideApi.has(route));
    const listed = new Set(matrix.map((entry) => entry.route));
    expect(declared.filter((route) => !listed.has(route))).toEqual([]);
    expect([...listed].filter((route) => !declared.includes(route))).toEqual([]);
    for (const entry of matrix) expect(entry.codes, entry.route).toMatch(/^[P34]{6}$/);
  });

  it('should answer 401 to signed-out callers and bad or revoked tokens on every route', async () => {
    const wrong: string[] = [];
    for (const entry of matrix) {
      const [method, path] = entry.route.split(' ') as [string, string];
      const url = entry.url ? entry.url(fixture) : path;
      for (const [name, header] of [
        ['signed out', undefined],
        ['bad token', 'Bearer tutti_not-a-token'],
        ['revoked token', `Bearer ${revokedToken}`],
      ] as const) {
        let call = app.anonymous[method.toLowerCase() as 'get'](url);
        if (header) call = call.set('Authorization', header);
        const status = (await call).status;
        if (status !== 401) wrong.push(`${entry.route} as ${name}: ${status}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('should answer each role as the table says on every route', { timeout: 300_000 }, async () => {
    const wrong: string[] = [];
    for (const entry of matrix) {
      const [method, path] = entry.route.split(' ') as [string, string];
      for (const [index, caller] of staff.entries()) {
        const url = entry.fresh
          ? await entry.fresh(app, fixture)
          : entry.url
            ? entry.url(fixture)
            : path;
        const client = app.bearer(tokens[caller]);
        const body = entry.body?.(fixture) ?? (method === 'PATCH' ? { version: 1 } : {});
        const call =
          method === 'GET'
            ? client.get(url)
            : method === 'DELETE'
              ? client.delete(url)
              : method === 'PATCH'
                ? client.patch(url, body)
                : method === 'PUT'
                  ? app.anonymous
                      .put(url)
                      .set('Authorization', `Bearer ${tokens[caller]}`)
                      .send(entry.body?.(fixture) ?? { state: { columns: [] } })
                  : client.post(url, body);
        const response = await call;
        const expected = entry.codes[index]!;
        const actual = [403, 404].includes(response.status)
          ? String(response.status)[2] === '3'
            ? '3'
            : '4'
          : response.status === 401
            ? '401'
            : 'P';
        if (response.status >= 500)
          wrong.push(
            `${entry.route} as ${caller}: ${response.status} ${JSON.stringify(response.body).slice(0, 160)}`,
          );
        else if (actual !== expected)
          wrong.push(`${entry.route} as ${caller}: expected ${expected}, got ${response.status}`);
      }
    }
    expect(wrong).toEqual([]);
  });
});
