import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { migrateDatabase, openDatabase, pgliteStartParams } from '../../server/db/client';
import { seedDemo } from '../../server/seed/demo';
import { schools } from '../../server/db/schema/index';
import { loadBenchStudents } from './bench-district';
import { figure, type BenchFigure } from './bench-figure';
import { buildServer } from '../../scripts/build-server';

/** Builds a data folder on disk with the demo district plus generated students. */
export async function buildDataFolder(students: number): Promise<string> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-bench-start-'));
  const handle = await openDatabase({ kind: 'pglite', dataDir });
  await migrateDatabase(handle);
  await seedDemo(handle.db);
  const schoolIds = (await handle.db.select({ id: schools.id }).from(schools)).map((row) => row.id);
  await loadBenchStudents(handle.pglite!, schoolIds, Math.max(0, students - 1_670));
  await handle.close();
  return dataDir;
}

function timeUntil(
  command: string,
  args: string[],
  environment: NodeJS.ProcessEnv,
  ready: (output: string) => Promise<boolean> | boolean,
): Promise<number> {
  return new Promise((resolve, reject) => {
    const start = performance.now();
    const child = spawn(command, args, {
      env: { ...process.env, ...environment },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    let done = false;
    const check = async () => {
      if (done) return;
      if (await ready(output)) {
        done = true;
        const elapsed = performance.now() - start;
        child.kill('SIGTERM');
        child.on('close', () => resolve(elapsed));
      }
    };
    child.stdout.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      void check();
    });
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.on('error', reject);
    child.on('close', (code) => !done && reject(new Error(`exited ${code}: ${output}`)));
  });
}

/**
 * Cold start of the server on an existing data folder to the first answered `/api/me`, against a
 * process that only opens PGlite on the same folder and runs one query. Target: under 1.5 s.
 */
export async function benchStartup(options: { students: number }): Promise<BenchFigure[]> {
  const dataDir = await buildDataFolder(options.students);
  try {
    const limit = await timeUntil(
      process.execPath,
      [
        '--input-type=module',
        '-e',
        `import { PGlite } from '@electric-sql/pglite'; const db = await PGlite.create(${JSON.stringify(path.join(dataDir, 'pg'))}, { startParams: ${JSON.stringify(pgliteStartParams)} }); await db.query('select 1'); console.log('open'); await db.close();`,
      ],
      {},
      (output) => output.includes('open'),
    );
    const environment = {
      TUTTI_DATA_DIR: dataDir,
      PORT: '0',
      LOG_LEVEL: 'info',
      OIDC_ISSUER: 'http://127.0.0.1:9',
    };
    const answersMe = async (output: string) => {
      const url = /"url":"(http:\/\/[^"]+)"/.exec(output)?.[1];
      if (!url) return false;
      const response = await fetch(`${url}/api/me`).catch(() => undefined);
      return response?.status === 401;
    };
    // The production start: the server bundle `npm run build` writes (scripts/build-server.ts).
    const bundle = await buildServer();
    const product = await timeUntil(process.execPath, [bundle], environment, answersMe);
    // `npm start` runs the sources through tsx, which compiles each module as it loads.
    const fromSources = await timeUntil(
      process.execPath,
      ['--import', 'tsx', 'server/main.ts'],
      environment,
      answersMe,
    );
    const students = options.students.toLocaleString('en-US');
    return [
      figure(
        `cold start to first /api/me (${students} students)`,
        product,
        limit,
        `target < 1,500 ms: ${product < 1500 ? 'met' : 'NOT met'}; node dist/server/main.mjs; limit = a process opening PGlite alone`,
      ),
      figure(
        `  the same from the sources through tsx (npm start)`,
        fromSources,
        limit,
        'for comparison: tsx compiles every module as it loads',
      ),
    ];
  } finally {
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}
