import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, rowsOf } from '../../server/db/client';
import { sql } from 'drizzle-orm';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';
import { runTutti } from '../support/cli';

let app: TestApp;
beforeAll(async () => {
  app = await startTestApp();
});
afterAll(() => app?.close());

describe('When the identity provider is down', () => {
  it('should show a clear sign-in error page while tokens keep working', async () => {
    const token = await app.token(demoEmail('coordinator'));
    await app.oidc.close();
    const page = await app.anonymous.get('/auth/sign-in');
    expect(page.status).toBe(503);
    expect(page.text).toContain('Sign-in is not available right now');
    expect(page.text).not.toMatch(/<script/i);
    const me = await app.bearer(token).get('/api/me');
    expect(me.status).toBe(200);
  });
});

describe('Rate limits', () => {
  it('should answer 429 when an address keeps sending bad tokens', async () => {
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 35; attempt += 1) {
      statuses.push((await app.bearer(`tutti_guess-${attempt}`).get('/api/me')).status);
    }
    expect(statuses.slice(0, 30).every((status) => status === 401)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
  });

  it('should still take a valid token from an address that sent too many bad ones', async () => {
    // The address (127.0.0.1) is over its failed-token limit from the test above.
    expect((await app.bearer('tutti_guess-again').get('/api/me')).status).toBe(429);
    const token = await app.token(demoEmail('director.hpms'));
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 5; attempt += 1) {
      statuses.push((await app.bearer(token).get('/api/me')).status);
    }
    expect(statuses).toEqual([200, 200, 200, 200, 200]);
    // A good token's answers are not failures: the next bad one is still refused, not counted anew.
    expect((await app.bearer('tutti_guess-last').get('/api/me')).status).toBe(429);
  });
});

const tables = ['schools', 'users', 'user_schools', 'students', 'ensembles', 'enrollments'];

async function countRows(dataDir: string): Promise<Record<string, number>> {
  const handle = await openDatabase({ kind: 'pglite', dataDir });
  try {
    const counts: Record<string, number> = {};
    for (const table of tables) {
      const [row] = rowsOf<{ total: number }>(await handle.db.execute(sql.raw(`select count(*)::int as total from ${table}`)));
      counts[table] = row!.total;
    }
    return counts;
  } finally {
    await handle.close();
  }
}

describe('tutti backup and restore', () => {
  it('should restore a backup into a fresh data folder with every row', async () => {
    const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-backup-'));
    const original = path.join(root, 'original');
    const restored = path.join(root, 'restored');
    const backupFile = path.join(root, 'district.tar.gz');
    expect((await runTutti(['seed', '--demo'], { TUTTI_DATA_DIR: original })).code).toBe(0);
    const backup = await runTutti(['backup', backupFile], { TUTTI_DATA_DIR: original });
    expect(backup.code, backup.stderr).toBe(0);
    expect(fs.statSync(backupFile).size).toBeGreaterThan(10_000);
    const restore = await runTutti(['restore', backupFile], { TUTTI_DATA_DIR: restored });
    expect(restore.code, restore.stderr).toBe(0);
    const [before, after] = [await countRows(original), await countRows(restored)];
    expect(before['students']).toBeGreaterThan(1000);
    expect(after).toEqual(before);
    fs.rmSync(root, { recursive: true, force: true });
  }, 120_000);

  it('should refuse a file that is not a backup and leave the database as it was', async () => {
    const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-backup-'));
    const dataDir = path.join(root, 'data');
    expect((await runTutti(['seed', '--demo'], { TUTTI_DATA_DIR: dataDir })).code).toBe(0);
    const before = await countRows(dataDir);
    const junk = path.join(root, 'junk.tar.gz');
    fs.writeFileSync(junk, 'this is not a database');
    const restore = await runTutti(['restore', junk], { TUTTI_DATA_DIR: dataDir });
    expect(restore.code).toBe(1);
    expect(restore.stderr).toContain('left as it was');
    expect(await countRows(dataDir)).toEqual(before);
    expect((await runTutti(['restore', path.join(root, 'missing.tar.gz')], { TUTTI_DATA_DIR: dataDir })).code).toBe(2);
    fs.rmSync(root, { recursive: true, force: true });
  }, 120_000);
});
