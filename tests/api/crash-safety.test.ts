import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, rowsOf } from '../../server/db/client';
import { toRosterCsv } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { runTutti } from '../support/cli';
import { startServerProcess, type ServerProcess } from '../support/server-process';

const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-crash-'));
const dataDir = path.join(root, 'data');
let server: ServerProcess | undefined;

beforeAll(async () => {
  expect((await runTutti(['seed', '--demo'], { TUTTI_DATA_DIR: dataDir })).code).toBe(0);
}, 120_000);

afterAll(async () => {
  await server?.stop().catch(() => undefined);
  fs.rmSync(root, { recursive: true, force: true });
});

/** Runs queries on the data folder while no server holds it. */
async function query<Row>(text: string, params: unknown[] = []): Promise<Row[]> {
  const handle = await openDatabase({ kind: 'pglite', dataDir });
  try {
    return rowsOf<Row>(await handle.pglite!.query(text, params as never[]));
  } finally {
    await handle.close();
  }
}

const studentCount = async () =>
  (await query<{ total: number }>('select count(*)::int as total from students'))[0]!.total;

describe('Crash safety', () => {
  it('should keep a roster import wholly in or wholly out when the server is killed during it', async () => {
    const outcomes: ('in' | 'out')[] = [];
    // Kills at several moments after the upload starts, so the kill lands at different steps.
    for (const [attempt, delay] of [300, 800, 1_500].entries()) {
      const before = await studentCount();
      const rows = inventedRoster(20_000, 50 + attempt, 500_000 + attempt * 100_000);
      const newStudents = new Set(rows.map((row) => row.studentId)).size;
      server = await startServerProcess(dataDir);
      const upload = fetch(`${server.url}/api/local/imports`, {
        method: 'POST',
        headers: {
          'x-tutti-local-key': server.localKey,
          'x-file-name': 'nightly.csv',
          'content-type': 'text/csv',
        },
        body: toRosterCsv(rows),
      }).catch(() => undefined);
      await new Promise((resolve) => setTimeout(resolve, delay));
      await server.kill();
      server = undefined;
      await upload;
      // The next start takes back what a large import had added ahead of its final
      // transaction (landed-students.ts); what the district sees from then on is counted.
      server = await startServerProcess(dataDir);
      await server.stop();
      server = undefined;
      const [left] = await query<{ count: number }>(
        'select count(*)::int as count from roster_import_landings',
      );
      expect(left!.count).toBe(0);
      const added = (await studentCount()) - before;
      expect([0, newStudents]).toContain(added);
      outcomes.push(added === 0 ? 'out' : 'in');
    }
    // The folder opens and serves after every kill.
    server = await startServerProcess(dataDir);
    expect((await fetch(`${server.url}/api/me`)).status).toBe(401);
    await server.stop();
    server = undefined;
    expect(outcomes).toHaveLength(3);
  }, 300_000);

  it('should keep every acknowledged pass-off when the server is killed during a burst', async () => {
    server = await startServerProcess(dataDir);
    const token = await fetch(`${server.url}/api/local/tokens`, {
      method: 'POST',
      headers: { 'x-tutti-local-key': server.localKey, 'content-type': 'application/json' },
      body: JSON.stringify({ email: 'director.hpms@merrowbasin.example' }),
    }).then(async (response) => ((await response.json()) as { token: string }).token);
    const headers = { authorization: `Bearer ${token}`, 'content-type': 'application/json' };
    const students = (await (
      await fetch(`${server.url}/api/students?limit=50&status=active`, { headers })
    ).json()) as { rows: { id: number }[] };
    const ladder = (await (await fetch(`${server.url}/api/ladder`, { headers })).json()) as {
      rungs: { requirements: { code: string; tempo: number }[] }[];
    };
    const requirements = ladder.rungs.flatMap((rung) => rung.requirements);
    expect(students.rows.length).toBeGreaterThan(10);
    expect(requirements.length).toBeGreaterThan(3);

    const acknowledged: string[] = [];
    const statuses: string[] = [];
    let stop = false;
    const sender = async (lane: number) => {
      for (let index = lane; !stop; index += 4) {
        const clientKey = randomUUID();
        const body = {
          studentId: students.rows[index % students.rows.length]!.id,
          requirementCode: requirements[index % requirements.length]!.code,
          heardOn: '2026-11-30',
          tempo: requirements[index % requirements.length]!.tempo,
          passed: index % 3 !== 0,
          clientKey,
        };
        const response = await fetch(`${server!.url}/api/pass-offs`, {
          method: 'POST',
          headers,
          body: JSON.stringify(body),
        }).catch(() => undefined);
        if (!response) return;
        if (response.status === 201 || response.status === 200) acknowledged.push(clientKey);
        else statuses.push(`${response.status} ${(await response.text()).slice(0, 200)}`);
      }
    };
    const lanes = [0, 1, 2, 3].map(sender);
    // Kills once the burst is well under way, with requests in flight.
    for (let waited = 0; acknowledged.length < 30 && waited < 20_000; waited += 100) {
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    await server.kill();
    server = undefined;
    stop = true;
    await Promise.all(lanes);
    expect(acknowledged.length, statuses.slice(0, 3).join('\n')).toBeGreaterThan(5);
    const stored = await query<{ client_key: string }>(
      'select client_key::text from pass_offs where client_key::text = any($1)',
      [acknowledged],
    );
    expect(stored.map((row) => row.client_key).sort()).toEqual([...acknowledged].sort());
  }, 180_000);
});
