import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, rowsOf } from '../../server/db/client';
import { runTutti } from '../support/cli';
import { startServerProcess, type ServerProcess } from '../support/server-process';
import { expectedStart, readRosterBefore } from '../support/year-start-expectation';

const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-year-cli-'));
const dataDir = path.join(root, 'data');
const environment = { TUTTI_DATA_DIR: dataDir };
let server: ServerProcess | undefined;

beforeAll(async () => {
  const seeded = await runTutti(['seed', '--demo'], environment);
  expect(seeded.code, seeded.stderr).toBe(0);
}, 180_000);

afterAll(async () => {
  await server?.kill().catch(() => undefined);
  fs.rmSync(root, { recursive: true, force: true });
});

/** Reads the data folder while no process holds it. */
async function inFolder<Result>(
  work: (
    query: <Row>(text: string) => Promise<Row[]>,
    handle: Awaited<ReturnType<typeof openDatabase>>,
  ) => Promise<Result>,
): Promise<Result> {
  const handle = await openDatabase({ kind: 'pglite', dataDir });
  try {
    return await work(async (text) => rowsOf(await handle.pglite!.query(text)), handle);
  } finally {
    await handle.close();
  }
}

const footprint = () =>
  inFolder(
    async (query) =>
      (
        await query<Record<string, unknown>>(`select
    (select string_agg(name || ':' || current, ',' order by starts_on) from school_years) as years,
    (select count(*)::int from student_years) as history,
    (select count(*)::int from enrollments) as seats,
    (select sum(grade)::int from students) as grades,
    (select count(*)::int from students where status = 'active') as active,
    (select count(*)::int from school_moves) as moves`)
      )[0]!,
  );

/** The arguments of `year start <name> --starts <first day> --ends <last day>`, then any flags. */
const yearStart = (name: string, starts: string, ends: string, ...flags: string[]) => [
  'year',
  'start',
  name,
  '--starts',
  starts,
  '--ends',
  ends,
  ...flags,
];

const contractKeys = [
  'year',
  'students',
  'promoted',
  'graduated',
  'movingUp',
  'leaving',
  'ensembles',
  'seats',
  'loansCarried',
  'loansDueBack',
  'committed',
];

describe('tutti year start', () => {
  it('should exit 2 with the reason and write nothing for a bad command or a year that does not fit', async () => {
    const before = await footprint();
    const cases: [string[], string][] = [
      [['year', 'start', '2027-28', '--starts', '2027-08-16'], '--ends'],
      [yearStart('2027-28', '2027-08-16', '2027-13-01'), '--ends'],
      [yearStart('2027-28', '2028-06-09', '2027-08-16'), 'first day comes before'],
      [['year', 'start', '--starts', '2027-08-16', '--ends', '2028-06-09'], 'Name exactly one'],
      [
        yearStart('2027-28', '2027-08-16', '2028-06-09', '--promote-all'),
        "Unknown option '--promote-all'",
      ],
      [['year', 'finish', '2027-28'], 'Unknown year command'],
      [yearStart('2026-27', '2030-08-16', '2031-06-09'), 'already exists'],
      [yearStart('2027-28', '2027-06-01', '2028-06-09'), 'overlaps 2026-27'],
      [yearStart('2024-25', '2024-08-19', '2025-06-13', '--json'), 'must start after'],
    ];
    for (const [args, reason] of cases) {
      const run = await runTutti(args, environment);
      expect(run.code, args.join(' ')).toBe(2);
      expect(run.stderr).toContain(reason);
    }
    expect(await footprint()).toEqual(before);
  }, 120_000);

  it('should print the contract JSON for a dry run, write nothing, and exit 0', async () => {
    const before = await footprint();
    const expected = await inFolder(async (_query, handle) =>
      expectedStart(await readRosterBefore(handle), '2027-08-16'),
    );
    const run = await runTutti(
      yearStart('2027-28', '2027-08-16', '2028-06-09', '--dry-run', '--json'),
      environment,
    );
    expect(run.code, run.stderr).toBe(0);
    const printed = JSON.parse(run.stdout);
    expect(Object.keys(printed)).toEqual(contractKeys);
    expect(printed).toEqual({ year: '2027-28', ...expected.counts, committed: false });
    expect(await footprint()).toEqual(before);
  }, 60_000);

  it('should leave the old year current and nothing of the new one when the process is killed in the middle of a start', async () => {
    const before = await footprint();
    for (const step of ['history', 'seats', 'students', 'switched']) {
      const output = await new Promise<{ signal: string | null; stdout: string }>((resolve) => {
        const child = spawn(
          process.execPath,
          [
            '--import',
            'tsx',
            path.resolve('tests/support/year-start-crash.ts'),
            '2027-28',
            '2027-08-16',
            '2028-06-09',
          ],
          {
            env: { ...process.env, ...environment, LOG_LEVEL: 'silent', YEAR_START_CRASH_AT: step },
            stdio: ['ignore', 'pipe', 'pipe'],
          },
        );
        let stdout = '';
        child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
        child.on('close', (_code, signal) => resolve({ signal, stdout }));
      });
      expect(output.signal, output.stdout).toBe('SIGKILL');
      expect(output.stdout).toContain(`${step}\n`);
      expect(output.stdout).not.toContain('finished');
      expect(await footprint()).toEqual(before);
    }
  }, 180_000);

  it('should start the year, counted as a plain computation counts, and refuse it a second time', async () => {
    const expected = await inFolder(async (_query, handle) =>
      expectedStart(await readRosterBefore(handle), '2027-08-16'),
    );
    const run = await runTutti(
      yearStart('2027-28', '2027-08-16', '2028-06-09', '--json'),
      environment,
    );
    expect(run.code, run.stderr).toBe(0);
    expect(JSON.parse(run.stdout)).toEqual({
      year: '2027-28',
      ...expected.counts,
      committed: true,
    });
    const years = await inFolder((query) =>
      query<{ name: string }>('select name from school_years where current'),
    );
    expect(years).toEqual([{ name: '2027-28' }]);
    const again = await runTutti(
      yearStart('2027-28', '2027-08-16', '2028-06-09', '--json'),
      environment,
    );
    expect(again.code).toBe(2);
    expect(again.stderr).toContain('already exists');
  }, 60_000);

  it('should work through a running server, which holds the data folder', async () => {
    server = await startServerProcess(dataDir);
    const bad = await runTutti(yearStart('2028-29', '2028-01-10', '2028-12-01'), environment);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('overlaps 2027-28');
    const dry = await runTutti(
      yearStart('2028-29', '2028-08-14', '2029-06-08', '--dry-run', '--json'),
      environment,
    );
    expect(dry.code, dry.stderr).toBe(0);
    expect(JSON.parse(dry.stdout).committed).toBe(false);
    const run = await runTutti(yearStart('2028-29', '2028-08-14', '2029-06-08'), environment);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stdout).toContain('Committed: 2028-29 is the current year');
    await server.stop();
    server = undefined;
    const years = await inFolder((query) =>
      query<{ name: string }>('select name from school_years where current'),
    );
    expect(years).toEqual([{ name: '2028-29' }]);
  }, 120_000);
});
