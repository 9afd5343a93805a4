import { randomBytes } from 'node:crypto';
import { mkdir, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';

/** How long an upload waits for its commit. */
export const uploadLifetimeMs = 30 * 60 * 1000;

/** An upload kept for its commit. */
export interface StoredUpload {
  fileName: string;
  userId: number;
  bytes: Uint8Array;
}

const tokenShape = /^[A-Za-z0-9_-]{16,64}$/;

/**
 * Keeps uploaded rosters in the data folder for half an hour, each under a random token, so the
 * commit step reads the same bytes the preview did without a second upload. Only the user who
 * uploaded a file can read it back.
 */
export class UploadStore {
  constructor(private readonly folder: string) {}

  /** Keeps the bytes; answers the token that finds them again. */
  async save(upload: Omit<StoredUpload, 'bytes'>, bytes: Uint8Array): Promise<string> {
    await mkdir(this.folder, { recursive: true, mode: 0o700 });
    await this.sweep();
    const token = randomBytes(24).toString('base64url');
    await writeFile(this.file(token, 'roster'), bytes, { mode: 0o600 });
    await writeFile(this.file(token, 'json'), JSON.stringify(upload), { mode: 0o600 });
    return token;
  }

  /** The upload kept under the token for this user, unless it has expired. */
  async open(token: string, userId: number): Promise<StoredUpload | undefined> {
    if (!tokenShape.test(token)) return undefined;
    try {
      const details = JSON.parse(await readFile(this.file(token, 'json'), 'utf8')) as Omit<
        StoredUpload,
        'bytes'
      >;
      const kept = await stat(this.file(token, 'roster'));
      if (details.userId !== userId || Date.now() - kept.mtimeMs > uploadLifetimeMs)
        return undefined;
      return { ...details, bytes: new Uint8Array(await readFile(this.file(token, 'roster'))) };
    } catch {
      return undefined;
    }
  }

  /** Forgets an upload (after it has been committed). */
  async remove(token: string): Promise<void> {
    if (!tokenShape.test(token)) return;
    await Promise.all(
      ['roster', 'json'].map((kind) => rm(this.file(token, kind), { force: true })),
    );
  }

  /** Deletes uploads older than their lifetime. */
  async sweep(): Promise<void> {
    const names = await readdir(this.folder).catch(() => [] as string[]);
    await Promise.all(
      names.map(async (name) => {
        const file = path.join(this.folder, name);
        const info = await stat(file).catch(() => undefined);
        if (info && Date.now() - info.mtimeMs > uploadLifetimeMs) await rm(file, { force: true });
      }),
    );
  }

  private file(token: string, kind: string): string {
    return path.join(this.folder, `${token}.${kind}`);
  }
}
