import { execFileSync } from 'node:child_process';
import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runTutti } from '../support/cli';
import { startServerProcess, type ServerProcess } from '../support/server-process';

// A disk that fills up is made for real here: the server is a separate process on a copy of a
// seeded demo folder on a size-limited tmpfs, which needs the mount permission these tests run
// with.

const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-faults-'));
const seeded = path.join(root, 'seeded');
const running = new Set<ServerProcess>();
const mounts: string[] = [];

const refusal = {
  status: 503,
  code: 'database_unavailable',
  message:
    "The database cannot take changes right now (disk full or read-only). Nothing was changed; tell the district's IT.",
  fieldErrors: [],
};

beforeAll(async () => {
  const seed = await runTutti(['seed', '--demo'], { TUTTI_DATA_DIR: seeded });
  expect(seed.code, seed.stderr).toBe(0);
}, 240_000);

afterAll(async () => {
  for (const server of running) await server.kill().catch(() => undefined);
  for (const mount of mounts) execFileSync('umount', [mount]);
  fs.rmSync(root, { recursive: true, force: true });
});

async function start(dataDir: string, environment: NodeJS.ProcessEnv = {}): Promise<ServerProcess> {
  const server = await startServerProcess(dataDir, environment);
  running.add(server);
  return server;
}

async function stop(server: ServerProcess): Promise<void> {
  await server.stop();
  running.delete(server);
}

/** A director's API token, from the server's own local-command route. */
async function directorHeaders(server: ServerProcess): Promise<Record<string, string>> {
  const response = await fetch(`${server.url}/api/local/tokens`, {
    method: 'POST',
    headers: { 'x-tutti-local-key': server.localKey, 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'director.hpms@merrowbasin.example' }),
  });
  expect(response.status).toBe(201);
  const { token } = (await response.json()) as { token: string };
  return { authorization: `Bearer ${token}`, 'content-type': 'application/json' };
}

async function call(
  server: ServerProcess,
  headers: Record<string, string>,
  target: string,
  body?: object,
) {
  const response = await fetch(`${server.url}${target}`, {
    method: body ? 'POST' : 'GET',
    headers,
    body: body ? JSON.stringify(body) : undefined,
  });
  return { status: response.status, body: (await response.json()) as Record<string, unknown> };
}

/** A batch of pass-offs for the director's students, each with a fresh client key. */
async function passOffBatch(server: ServerProcess, headers: Record<string, string>, size: number) {
  const students = await call(server, headers, '/api/students?limit=20&status=active');
  const ladder = await call(server, headers, '/api/ladder');
  const rows = students.body['rows'] as { id: number }[];
  const requirements = (
    ladder.body['rungs'] as { requirements: { code: string; tempo: number }[] }[]
  ).flatMap((rung) => rung.requirements);
  expect(rows.length).toBeGreaterThan(5);
  return {
    passOffs: Array.from({ length: size }, (_, index) => ({
      studentId: rows[index % rows.length]!.id,
      requirementCode: requirements[index % requirements.length]!.code,
      heardOn: '2026-12-01',
      tempo: requirements[index % requirements.length]!.tempo,
      passed: true,
      // Long notes, so the batch needs new pages in the table rather than fitting a free one.
      note: `Steady tone through the top octave; ${'heard again after sectionals. '.repeat(30)}`.slice(
        0,
        1000,
      ),
      clientKey: randomUUID(),
    })),
  };
}

/** The reads a director's pages make, asked once before the fault so later reads repeat them. */
const reads = ['/api/me', '/api/students?limit=20&status=active', '/api/pass-offs?limit=5'];

describe('When the disk is full', () => {
  it('should refuse pass-offs with a clear 503, keep serving reads, and take them once space is freed', async () => {
    const mount = path.join(root, 'small-disk');
    fs.mkdirSync(mount);
    const seededBytes = Number(execFileSync('du', ['-sb', seeded]).toString().split('\t')[0]);
    const megabytes = Math.ceil(seededBytes / 1024 / 1024) + 48;
    execFileSync('mount', ['-t', 'tmpfs', '-o', `size=${megabytes}m`, 'tmpfs', mount]);
    mounts.push(mount);
    const dataDir = path.join(mount, 'data');
    fs.cpSync(seeded, dataDir, { recursive: true });
    const server = await start(dataDir);
    const headers = await directorHeaders(server);
    const batch = await passOffBatch(server, headers, 200);
    for (const target of reads)
      expect((await call(server, headers, target)).status, target).toBe(200);
    const before = (await call(server, headers, '/api/pass-offs?limit=1')).body['total'];

    const filler = path.join(mount, 'filler');
    const descriptor = fs.openSync(filler, 'w');
    const chunk = Buffer.alloc(1024 * 1024, 1);
    try {
      for (;;) fs.writeSync(descriptor, chunk);
    } catch (error) {
      expect((error as NodeJS.ErrnoException).code).toBe('ENOSPC');
    } finally {
      fs.closeSync(descriptor);
    }

    const refused = await call(server, headers, '/api/pass-offs', batch);
    expect(refused).toEqual({ status: 503, body: { error: refusal } });
    for (const target of reads)
      expect((await call(server, headers, target)).status, target).toBe(200);
    expect((await call(server, headers, '/api/pass-offs?limit=1')).body['total']).toBe(before);

    // Space freed: the same server records the same batch whole, none of it as a repeat.
    fs.rmSync(filler);
    const recorded = await call(server, headers, '/api/pass-offs', batch);
    expect(recorded.status).toBe(201);
    expect({ created: recorded.body['created'], repeated: recorded.body['repeated'] }).toEqual({
      created: 200,
      repeated: 0,
    });
    await stop(server);
  }, 240_000);
});

/** Every file below a folder with its size and content hash, to show nothing was written. */
function folderState(folder: string): Record<string, string> {
  const state: Record<string, string> = {};
  for (const entry of fs.readdirSync(folder, { recursive: true, withFileTypes: true })) {
    if (!entry.isFile()) continue;
    const file = path.join(entry.parentPath, entry.name);
    const bytes = fs.readFileSync(file);
    state[path.relative(folder, file)] =
      `${bytes.length} ${createHash('sha256').update(bytes).digest('hex')}`;
  }
  return state;
}

describe('When the data folder is read-only', () => {
  it('should refuse to start with a clear message and leave the folder as it was', async () => {
    const mount = path.join(root, 'read-only-disk');
    fs.mkdirSync(mount);
    execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=512m', 'tmpfs', mount]);
    mounts.push(mount);
    const dataDir = path.join(mount, 'data');
    fs.cpSync(seeded, dataDir, { recursive: true });
    execFileSync('mount', ['-o', 'remount,ro', mount]);
    const before = folderState(dataDir);
    const failed = await start(dataDir).then(
      () => 'started',
      (error: unknown) => String(error),
    );
    expect(failed).toContain('The server exited with 1');
    expect(failed).toContain(
      `Tuttiboard could not start: The data folder ${dataDir} cannot be written (EROFS)`,
    );
    expect(folderState(dataDir)).toEqual(before);
    // Made writable again, the same folder opens with every row.
    execFileSync('mount', ['-o', 'remount,rw', mount]);
    const server = await start(dataDir);
    const headers = await directorHeaders(server);
    expect((await call(server, headers, '/api/students?limit=1')).status).toBe(200);
    await stop(server);
  }, 240_000);
});
