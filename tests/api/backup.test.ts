import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import * as tar from 'tar';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, rowsOf } from '../../server/db/client';
import { runTutti } from '../support/cli';
import { startServerProcess, type ServerProcess } from '../support/server-process';
import { demoEmail } from '../support/test-app';
import { binary } from '../support/binary-body';

// A 1×1 PNG: the 8-byte signature 89 50 4E 47 0D 0A 1A 0A (PNG specification, "PNG signature"), IHDR, IDAT, IEND.
const onePixelPng = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
  'base64',
);
// WAVE header: "RIFF", size, "WAVE", then a fmt chunk (Multimedia Programming Interface 1.0).
const wave = Buffer.concat([
  Buffer.from('RIFF'),
  Buffer.from([0x24, 0, 0, 0]),
  Buffer.from('WAVEfmt '),
  Buffer.alloc(64, 7),
]);

const environment = (dataDir: string): NodeJS.ProcessEnv => ({
  TUTTI_DATA_DIR: dataDir,
  DATABASE_URL: undefined,
});

let root: string;
let seeded: string;
const servers: ServerProcess[] = [];

/** A copy of the seeded demo folder. */
function demoFolder(name: string): string {
  const folder = path.join(root, name);
  fs.cpSync(seeded, folder, { recursive: true });
  return folder;
}

const tables = ['students', 'pass_offs', 'instrument_photos', 'pass_off_recordings', 'audit_log'];

async function countRows(dataDir: string): Promise<Record<string, number>> {
  const handle = await openDatabase({ kind: 'pglite', dataDir });
  try {
    const counts: Record<string, number> = {};
    for (const table of tables) {
      const [row] = rowsOf<{ total: number }>(
        await handle.db.execute(sql.raw(`select count(*)::int as total from ${table}`)),
      );
      counts[table] = row!.total;
    }
    return counts;
  } finally {
    await handle.close();
  }
}

/** Every file under a folder with its size, for "left as it was". */
function listing(folder: string): string[] {
  return (fs.readdirSync(folder, { recursive: true, withFileTypes: true }) as fs.Dirent[])
    .filter((entry) => entry.isFile() && entry.name !== 'tutti.lock')
    .map((entry) => {
      const file = path.join(entry.parentPath, entry.name);
      return `${path.relative(folder, file)} ${fs.statSync(file).size}`;
    })
    .sort();
}

/** A new API token through the running server's local-command route (what `tutti token` calls). */
async function tokenFor(server: ServerProcess, local: string): Promise<string> {
  const issued = await request(server.url)
    .post('/api/local/tokens')
    .set('x-tutti-local-key', server.localKey)
    .send({ email: demoEmail(local) });
  expect(issued.status, issued.text).toBe(201);
  return issued.body.token as string;
}

/** Reads a .tar.gz into a map of entry path to bytes. */
async function entriesOf(bytes: Buffer): Promise<Map<string, Buffer>> {
  const entries = new Map<string, Buffer>();
  const parser = new tar.Parser({
    strict: true,
    onReadEntry: (entry) => {
      const chunks: Buffer[] = [];
      entry.on('data', (chunk: Buffer) => chunks.push(chunk));
      entry.on('end', () => entries.set(entry.path, Buffer.concat(chunks)));
    },
  });
  await new Promise<void>((resolve, reject) => {
    parser.on('end', resolve);
    parser.on('error', reject);
    parser.end(bytes);
  });
  return entries;
}

beforeAll(async () => {
  root = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-backup-'));
  seeded = path.join(root, 'seeded');
  const seeding = await runTutti(['seed', '--demo'], environment(seeded));
  expect(seeding.code, seeding.stderr).toBe(0);
}, 300_000);
afterAll(async () => {
  for (const server of servers) await server.stop();
  fs.rmSync(root, { recursive: true, force: true });
});

describe('tutti backup while the server runs, and tutti restore', () => {
  it('should back up the database and its files through the running server and restore both', async () => {
    const original = demoFolder('original');
    const server = await startServerProcess(original);
    servers.push(server);
    const technician = await tokenFor(server, 'technician');
    const director = await tokenFor(server, 'director.hpms');
    const api = request(server.url);

    const instrument = (
      await api.get('/api/instruments?limit=1').set('Authorization', `Bearer ${technician}`)
    ).body.rows[0];
    const photo = await api
      .post(`/api/instruments/${instrument.id}/photos`)
      .set('Authorization', `Bearer ${technician}`)
      .attach('photo', onePixelPng, { filename: 'bell.png', contentType: 'image/png' });
    expect(photo.status, photo.text).toBe(201);
    const passOff = (
      await api.get('/api/pass-offs?limit=1').set('Authorization', `Bearer ${director}`)
    ).body.rows[0];
    const recording = await api
      .post(`/api/pass-offs/${passOff.id}/recording`)
      .set('Authorization', `Bearer ${director}`)
      .attach('recording', wave, { filename: 'take.wav', contentType: 'audio/wav' });
    expect(recording.status, recording.text).toBe(201);

    // The server keeps answering while the backup runs: pages asked for during it all answer.
    const backupFile = path.join(root, 'district.tar.gz');
    let backingUp = true;
    const backup = runTutti(['backup', backupFile], environment(original)).finally(
      () => (backingUp = false),
    );
    const statuses: number[] = [];
    while (backingUp) {
      statuses.push(
        (await api.get('/api/students?limit=100').set('Authorization', `Bearer ${director}`))
          .status,
      );
    }
    const backedUp = await backup;
    expect(backedUp.code, backedUp.stderr).toBe(0);
    expect(backedUp.stdout).toContain('2 files');
    expect(statuses.length).toBeGreaterThan(0);
    expect(statuses.every((status) => status === 200)).toBe(true);

    // The archive's manifest counts and checks what it holds.
    const entries = await entriesOf(fs.readFileSync(backupFile));
    const manifest = JSON.parse(entries.get('manifest.json')!.toString());
    expect(manifest.files.count).toBe(2);
    expect(
      manifest.files.list.map((file: { path: string }) => file.path.split('/')[0]).sort(),
    ).toEqual(['photos', 'recordings']);
    expect([...entries.keys()][0]).toBe('manifest.json');
    await server.stop();
    const before = await countRows(original);

    const restored = path.join(root, 'restored');
    const restore = await runTutti(['restore', backupFile], environment(restored));
    expect(restore.code, restore.stderr).toBe(0);
    expect(await countRows(restored)).toEqual(before);
    expect(before['instrument_photos']).toBeGreaterThan(0);

    const again = await startServerProcess(restored);
    servers.push(again);
    const photoBack = await binary(
      request(again.url).get(photo.body.url).set('Authorization', `Bearer ${technician}`),
    );
    expect(photoBack.status).toBe(200);
    expect(Buffer.compare(photoBack.body as Buffer, onePixelPng)).toBe(0);
    const recordingBack = await binary(
      request(again.url)
        .get(`/api/pass-offs/${passOff.id}/recording`)
        .set('Authorization', `Bearer ${director}`),
    );
    expect(recordingBack.status).toBe(200);
    expect(Buffer.compare(recordingBack.body as Buffer, wave)).toBe(0);

    // A coordinator downloads the same kind of archive from the app; nobody else may.
    const coordinator = await tokenFor(again, 'coordinator');
    const download = await binary(
      request(again.url).get('/api/backup').set('Authorization', `Bearer ${coordinator}`),
    );
    expect(download.status).toBe(200);
    expect(download.headers['content-type']).toContain('application/gzip');
    expect(download.headers['content-disposition']).toMatch(
      /^attachment; filename="tuttiboard-backup-.*\.tar\.gz"$/,
    );
    const downloaded = await entriesOf(download.body as Buffer);
    expect(JSON.parse(downloaded.get('manifest.json')!.toString()).files.count).toBe(2);
    expect(
      downloaded.get(
        'files/' +
          manifest.files.list.find((file: { path: string }) => file.path.startsWith('photos/'))
            .path,
      ),
    ).toEqual(onePixelPng);
    for (const local of ['director.hpms', 'technician', 'viewer.trhs']) {
      const refused = await request(again.url)
        .get('/api/backup')
        .set('Authorization', `Bearer ${await tokenFor(again, local)}`);
      expect(refused.status).toBe(403);
    }
    expect((await request(again.url).get('/api/backup')).status).toBe(401);
    await again.stop();
  }, 600_000);

  it('should say to use pg_dump and copy the files folder on a PostgreSQL server', async () => {
    const answer = await runTutti(['backup', path.join(root, 'never.tar.gz')], {
      TUTTI_DATA_DIR: path.join(root, 'files'),
      DATABASE_URL: 'postgres://tutti@127.0.0.1:9/tutti',
    });
    expect(answer.code).toBe(1);
    expect(answer.stderr).toContain('pg_dump');
    expect(answer.stderr).toContain(path.join(root, 'files'));
    expect(fs.existsSync(path.join(root, 'never.tar.gz'))).toBe(false);
  });
});

describe('tutti restore of a damaged backup', () => {
  let backupFile: string;
  let target: string;
  let before: { rows: Record<string, number>; files: string[] };

  beforeAll(async () => {
    const source = demoFolder('damaged-source');
    fs.mkdirSync(path.join(source, 'photos'));
    fs.writeFileSync(path.join(source, 'photos', 'kept.png'), onePixelPng);
    backupFile = path.join(root, 'whole.tar.gz');
    const backup = await runTutti(['backup', backupFile], environment(source));
    expect(backup.code, backup.stderr).toBe(0);
    target = demoFolder('damaged-target');
    fs.mkdirSync(path.join(target, 'recordings'));
    fs.writeFileSync(path.join(target, 'recordings', 'only-here.wav'), wave);
    before = { rows: await countRows(target), files: listing(target) };
  }, 300_000);

  /** Restores `bytes` over the target and checks the one-line refusal and the untouched folder. */
  async function refused(name: string, bytes: Buffer, reason: RegExp) {
    const file = path.join(root, name);
    fs.writeFileSync(file, bytes);
    const answer = await runTutti(['restore', file], environment(target));
    expect(answer.code, answer.stderr).toBe(2);
    expect(answer.stdout).toBe('');
    const lines = answer.stderr.trim().split('\n');
    expect(lines, answer.stderr).toHaveLength(1);
    expect(lines[0]).toMatch(reason);
    expect(lines[0]).toContain('Nothing was changed');
    expect(answer.stderr).not.toMatch(/^\s+at /m);
    expect(listing(target)).toEqual(before.files);
  }

  it('should refuse a truncated archive with one message and exit 2, leaving the folder as it was', async () => {
    const whole = fs.readFileSync(backupFile);
    await refused(
      'truncated.tar.gz',
      whole.subarray(0, Math.floor(whole.length / 2)),
      /ends early/,
    );
    expect(await countRows(target)).toEqual(before.rows);
  }, 120_000);

  it('should refuse an archive with damaged bytes or a file that does not match its manifest', async () => {
    const whole = fs.readFileSync(backupFile);
    const damaged = Buffer.from(whole);
    damaged.fill(0x58, Math.floor(whole.length / 3), Math.floor(whole.length / 3) + 64);
    await refused('damaged.tar.gz', damaged, /damaged|checksum|not a whole/);
    await refused(
      'junk.tar.gz',
      Buffer.from('this is not a backup'),
      /not a whole|ends early|damaged/,
    );

    // A whole archive whose photo was swapped after the manifest was written.
    const unpacked = path.join(root, 'unpacked');
    fs.mkdirSync(unpacked);
    await tar.x({ file: backupFile, cwd: unpacked });
    fs.writeFileSync(
      path.join(unpacked, 'files', 'photos', 'kept.png'),
      Buffer.from('not the photo'),
    );
    const repacked = path.join(root, 'repacked.tar.gz');
    await tar.c({ gzip: true, file: repacked, cwd: unpacked }, [
      'manifest.json',
      'database.tar',
      'files',
    ]);
    await refused(
      'swapped.tar.gz',
      fs.readFileSync(repacked),
      /photos\/kept\.png does not match the checksum/,
    );
    expect(await countRows(target)).toEqual(before.rows);
  }, 120_000);
});
