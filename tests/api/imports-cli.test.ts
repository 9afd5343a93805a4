import { execFile } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { rowsOf } from '../../server/db/client';
import { startServer } from '../../server/main';
import { startOneRosterFake } from '../../fakes/oneroster/index';
import { saveSyncSettings } from '../../server/oneroster/sync-service';
import { findUserByEmail } from '../../server/people/people-queries';

const run = promisify(execFile);
const fixtures = path.resolve('tests/fixtures/rosters');
const contractKeys = [
  'rows',
  'created',
  'updated',
  'unchanged',
  'withdrawn',
  'errors',
  'committed',
];
/** `tutti import <fixture> --json` against a data folder. */
const importFixture = (folder: string, name: string) =>
  tutti(folder, 'import', path.join(fixtures, name), '--json');
/** The contract's answer for a clean file whose every row is new. */
const allCreated = (rows: number, committed: boolean) => ({
  rows,
  created: rows,
  updated: 0,
  unchanged: 0,
  withdrawn: 0,
  errors: [],
  committed,
});
let seeded: string;
const folders: string[] = [];

/** A data folder holding the seeded demo district, copied so each test starts the same. */
function demoFolder(): string {
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-import-cli-'));
  fs.cpSync(seeded, folder, { recursive: true });
  folders.push(folder);
  return folder;
}

const secretKey = 'cli-test-secret-key-for-stored-secrets-000';

async function tutti(dataDir: string, ...args: string[]) {
  const environment: NodeJS.ProcessEnv = {
    ...process.env,
    TUTTI_DATA_DIR: dataDir,
    LOG_LEVEL: 'silent',
    TUTTI_SECRET_KEY: secretKey,
  };
  delete environment['DATABASE_URL'];
  try {
    const { stdout, stderr } = await run('node', ['bin/tutti.js', ...args], {
      env: environment,
      timeout: 120_000,
    });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const failed = error as { code: number; stdout: string; stderr: string };
    return { code: failed.code, stdout: failed.stdout, stderr: failed.stderr };
  }
}

/** The one JSON object `--json` prints, checked to be alone on standard output. */
function contract(stdout: string) {
  const lines = stdout.trim().split('\n');
  expect(lines).toHaveLength(1);
  const answer = JSON.parse(lines[0]!);
  expect(Object.keys(answer)).toEqual(contractKeys);
  return answer;
}

beforeAll(async () => {
  seeded = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-import-cli-seed-'));
  folders.push(seeded);
  const seeding = await tutti(seeded, 'seed', '--demo');
  expect(seeding.code, seeding.stderr).toBe(0);
}, 300_000);
afterAll(() => {
  for (const folder of folders) fs.rmSync(folder, { recursive: true, force: true });
});

describe('tutti import', () => {
  it('should exit 2 when the command is bad or the file cannot be read', async () => {
    const folder = demoFolder();
    const noFile = await tutti(folder, 'import', '--json');
    expect(noFile.code).toBe(2);
    expect(noFile.stdout).toBe('');
    expect(noFile.stderr).toContain('Usage: tutti import');
    const clean = path.join(fixtures, 'canonical-clean.csv');
    const unknownFlag = await tutti(folder, 'import', clean, '--commit-everything');
    expect(unknownFlag.code).toBe(2);
    expect(unknownFlag.stderr).toContain("Unknown option '--commit-everything'");
    const noSuchFile = path.join(folder, 'no-such-roster.csv');
    const missing = await tutti(folder, 'import', noSuchFile, '--json');
    expect(missing.code).toBe(2);
    expect(contract(missing.stdout)).toMatchObject({
      rows: 0,
      committed: false,
      errors: [{ line: 0, column: '' }],
    });
  }, 120_000);

  it('should change nothing on a dry run, then commit, then find every row unchanged', async () => {
    const folder = demoFolder();
    const file = path.join(fixtures, 'canonical-clean.csv');
    const dryRun = await tutti(folder, 'import', file, '--dry-run', '--json');
    expect(dryRun.code).toBe(0);
    expect(contract(dryRun.stdout)).toEqual(allCreated(7, false));
    const committed = await tutti(folder, 'import', file, '--json');
    expect(committed.code).toBe(0);
    expect(contract(committed.stdout)).toEqual(allCreated(7, true));
    const again = await tutti(folder, 'import', file);
    expect(again.code).toBe(0);
    expect(again.stdout).toContain('created 0, updated 0, unchanged 7, withdrawn 0');
  }, 180_000);

  it('should exit 1 and commit nothing when rows have errors, and commit the rest with --skip-invalid', async () => {
    const folder = demoFolder();
    const file = path.join(fixtures, 'errors-mixed.csv');
    const strict = await tutti(folder, 'import', file, '--json');
    expect(strict.code).toBe(1);
    const answer = contract(strict.stdout);
    expect(answer.committed).toBe(false);
    expect(answer.errors).toContainEqual({
      line: 6,
      column: 'grade',
      message: "Grade must be K or 1 to 12; got '13'.",
    });
    for (const error of answer.errors)
      expect(Object.keys(error)).toEqual(['line', 'column', 'message']);
    const readable = await tutti(folder, 'import', file);
    expect(readable.code).toBe(1);
    expect(readable.stdout).toContain('line 6, grade: Grade must be K or 1 to 12');
    const lenient = await tutti(folder, 'import', file, '--skip-invalid', '--json');
    expect(lenient.code).toBe(0);
    expect(contract(lenient.stdout)).toMatchObject({ rows: 10, created: 2, committed: true });
  }, 180_000);

  it('should import through the running server instead of opening its data folder', async () => {
    const folder = demoFolder();
    const server = await startServer(
      loadConfig({ TUTTI_DATA_DIR: folder, PORT: '0', LOG_LEVEL: 'silent' }),
      { host: '127.0.0.1' },
    );
    try {
      const result = await importFixture(folder, 'oneroster-bundle');
      expect(result.code, result.stderr).toBe(0);
      expect(contract(result.stdout)).toMatchObject({ rows: 6, created: 6, committed: true });
      // The server's own database holds the import: the command did not open the folder itself.
      const history = rowsOf<{ via: string; user_id: number | null; file_name: string }>(
        await server.database.db.execute(
          'select via, user_id, file_name from roster_imports' as never,
        ),
      );
      expect(history).toEqual([{ via: 'cli', user_id: null, file_name: 'oneroster-bundle.zip' }]);
      const student = rowsOf(
        await server.database.db.execute(
          `select 1 from students where student_number = 'HP-8001'` as never,
        ),
      );
      expect(student).toHaveLength(1);
    } finally {
      await server.close();
    }
  }, 180_000);
});

describe('tutti import of OneRoster bundles and the REST sync', () => {
  it('should import a 1.2 bundle, then a delta, and name an org that matches no school', async () => {
    const folder = demoFolder();
    const bulk = await importFixture(folder, 'oneroster-1.2-bundle');
    expect(bulk.code, bulk.stderr).toBe(0);
    expect(contract(bulk.stdout)).toMatchObject({ rows: 5, created: 5, committed: true });
    const delta = await importFixture(folder, 'oneroster-1.2-delta');
    expect(delta.code, delta.stderr).toBe(0);
    expect(contract(delta.stdout)).toMatchObject({
      rows: 2,
      created: 1,
      withdrawn: 1,
      committed: true,
    });

    const renamed = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-or-unmapped-'));
    folders.push(renamed);
    fs.cpSync(path.join(fixtures, 'oneroster-1.2-bundle'), renamed, { recursive: true });
    const orgs = path.join(renamed, 'orgs.csv');
    fs.writeFileSync(
      orgs,
      fs.readFileSync(orgs, 'utf8').replace('org-qh,,,Quarry Hill Middle', 'org-qz,,,North Annex'),
    );
    for (const name of ['roles.csv', 'classes.csv', 'enrollments.csv', 'users.csv']) {
      const file = path.join(renamed, name);
      fs.writeFileSync(file, fs.readFileSync(file, 'utf8').replaceAll('org-qh', 'org-qz'));
    }
    const unmapped = await tutti(folder, 'import', renamed, '--json');
    expect(unmapped.code).toBe(1);
    expect(contract(unmapped.stdout)).toMatchObject({
      committed: false,
      errors: [
        {
          line: 5,
          column: 'orgs.csv:identifier',
          message:
            "Org 'North Annex' (sourcedId 'org-qz', no identifier) matches no school of the district by identifier, saved mapping or name; choose its school in the import's mapping step.",
        },
      ],
    });
  }, 180_000);

  it('should run the saved REST sync through the server and on its own, and exit 2 when the provider is down', async () => {
    const provider = await startOneRosterFake({ port: 0 });
    const folder = demoFolder();
    const config = loadConfig({
      TUTTI_DATA_DIR: folder,
      PORT: '0',
      LOG_LEVEL: 'silent',
      TUTTI_SECRET_KEY: secretKey,
    });
    const server = await startServer(config, { host: '127.0.0.1' });
    try {
      const coordinator = await findUserByEmail(
        server.database.db,
        'coordinator@merrowbasin.example',
      );
      await saveSyncSettings(
        server.database.db,
        config,
        {
          userId: coordinator!.id,
          email: coordinator!.email,
          name: coordinator!.name,
          role: 'coordinator',
          schoolIds: [],
          studentId: null,
          via: 'session',
        },
        {
          baseUrl: provider.url,
          apiVersion: '1.1',
          tokenUrl: provider.tokenUrl,
          clientId: provider.clientId,
          clientSecret: provider.clientSecret,
          enabled: false,
          runAt: '02:00',
        },
      );
      const dry = await tutti(folder, 'import', '--from-oneroster-api', '--dry-run', '--json');
      expect(dry.code, dry.stderr).toBe(0);
      expect(contract(dry.stdout)).toMatchObject({ rows: 5, created: 5, committed: false });
      const first = await tutti(folder, 'import', '--from-oneroster-api', '--json');
      expect(first.code, first.stderr).toBe(0);
      expect(contract(first.stdout)).toMatchObject({ rows: 5, created: 5, committed: true });
      // 1EdTech OneRoster 1.1 REST binding: the 1.1 service's path.
      expect(provider.requests().some((line) => line.startsWith('/ims/oneroster/v1p1/users'))).toBe(
        true,
      );
    } finally {
      await server.close();
    }
    provider.touch('users', 'u-103', { givenName: 'Pria' });
    const second = await tutti(folder, 'import', '--from-oneroster-api', '--json');
    expect(second.code, second.stderr).toBe(0);
    expect(contract(second.stdout)).toMatchObject({ rows: 1, updated: 1, committed: true });
    await provider.close();
    const down = await tutti(folder, 'import', '--from-oneroster-api', '--json');
    expect(down.code).toBe(2);
    const answer = contract(down.stdout);
    expect(answer.committed).toBe(false);
    expect(answer.errors[0].message).toMatch(/^The token endpoint could not be reached/);
    expect(down.stdout + down.stderr).not.toContain(provider.clientSecret);
  }, 180_000);
});
