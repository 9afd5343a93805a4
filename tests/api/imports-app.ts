import { expect } from 'vitest';
import { rowsOf } from '../../server/db/client';
import {
  allButCoordinator,
  useTestApp,
  type SignedInClient,
  type TestApp,
} from '../support/test-app';

export const header =
  'student_id,first_name,last_name,preferred_name,grade,school_code,ensemble,instrument,guardian_name,guardian_email';

export function csvOf(...lines: string[]): Buffer {
  return Buffer.from(`${[header, ...lines].join('\r\n')}\r\n`);
}

/**
 * The demo district's app for a roster import test file, with the coordinator and every other
 * role signed in, and the steps those files take: upload, upload and commit, read the roster.
 */
export function useImportsApp() {
  const app = useTestApp({ signIn: ['coordinator', ...allButCoordinator] });
  const { coordinator } = app.clients;
  return { app, coordinator, ...importSteps(app, coordinator) };
}

/** The steps of a roster import test on a running app, the file committed by `coordinator`. */
export function importSteps(app: TestApp, coordinator: SignedInClient) {
  /** Uploads a roster as the wizard does: multipart, the file in the field `file`. */
  function preview(
    client: SignedInClient,
    file: Buffer,
    fields: Record<string, string> = {},
    fileName = 'roster.csv',
  ) {
    return client.upload('/api/imports/preview', 'file', file, fileName, fields);
  }

  async function previewAndCommit(
    file: Buffer,
    options: { withdrawMissing?: boolean; skipInvalid?: boolean; mapping?: object } = {},
  ) {
    const fields: Record<string, string> = {
      withdrawMissing: String(options.withdrawMissing ?? false),
    };
    if (options.mapping) fields['mapping'] = JSON.stringify(options.mapping);
    const previewed = await preview(coordinator, file, fields);
    expect(previewed.status).toBe(200);
    const committed = await coordinator.post('/api/imports/commit', {
      importToken: previewed.body.importToken,
      mapping: options.mapping,
      withdrawMissing: options.withdrawMissing ?? false,
      skipInvalid: options.skipInvalid ?? false,
    });
    expect(committed.status).toBe(200);
    return { previewed: previewed.body, committed: committed.body };
  }

  async function query<Row>(text: string): Promise<Row[]> {
    return rowsOf<Row>(await app.database.db.execute(text as never));
  }

  async function tableCount(table: string): Promise<number> {
    const [row] = await query<{ count: number }>(`select count(*)::int as count from ${table}`);
    return row!.count;
  }

  async function student(number: string) {
    const [row] = await query<{
      id: number;
      first_name: string;
      grade: number;
      status: string;
      guardian_email: string | null;
      version: number;
      code: string;
    }>(
      `select s.id, s.first_name, s.grade, s.status, s.guardian_email, s.version, sc.code from students s join schools sc on sc.id = s.school_id where s.student_number = '${number}'`,
    );
    return row;
  }

  return { preview, previewAndCommit, query, tableCount, student };
}
