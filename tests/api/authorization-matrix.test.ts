import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { sql } from 'drizzle-orm';
import { createApp } from '../../server/app';
import { rowsOf } from '../../server/db/client';
import { createLogger } from '../../server/logger';
import { writeRecordingFile } from '../../server/pass-offs/recordings-store';
import { hashToken } from '../../server/tokens/tokens-service';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';
import { matrix, outsideApi, staff, type Caller, type Fixture } from './route-access-table';

/** Checks every route against the table in `route-access-table.ts`, for every kind of caller. */

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
    coordinatorToken,
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
