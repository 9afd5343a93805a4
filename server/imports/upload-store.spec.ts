import { mkdtempSync, rmSync, readdirSync, utimesSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { UploadStore, uploadLifetimeMs } from './upload-store';

const folder = mkdtempSync(path.join(os.tmpdir(), 'tutti-upload-store-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('UploadStore', () => {
  const store = new UploadStore(path.join(folder, 'imports'));
  const bytes = new TextEncoder().encode('student_id,first_name\nHP-1,Ada\n');

  it('should give the same bytes back when the uploader opens the token', async () => {
    const token = await store.save({ fileName: 'spring.csv', userId: 4 }, bytes);
    expect(token).toMatch(/^[A-Za-z0-9_-]{32}$/);
    expect(await store.open(token, 4)).toEqual({ fileName: 'spring.csv', userId: 4, bytes });
  });

  it('should find nothing when another user, a made-up token or a path is given', async () => {
    const token = await store.save({ fileName: 'spring.csv', userId: 4 }, bytes);
    expect(await store.open(token, 5)).toBeUndefined();
    expect(await store.open('x'.repeat(32), 4)).toBeUndefined();
    expect(await store.open('../../etc/passwd', 4)).toBeUndefined();
  });

  it('should forget an upload when it is older than 30 minutes or removed', async () => {
    const stale = await store.save({ fileName: 'old.csv', userId: 4 }, bytes);
    const past = (Date.now() - uploadLifetimeMs - 60_000) / 1000;
    for (const kind of ['roster', 'json'])
      utimesSync(path.join(folder, 'imports', `${stale}.${kind}`), past, past);
    expect(await store.open(stale, 4)).toBeUndefined();
    await store.sweep();
    expect(readdirSync(path.join(folder, 'imports')).some((name) => name.startsWith(stale))).toBe(
      false,
    );
    const kept = await store.save({ fileName: 'new.csv', userId: 4 }, bytes);
    await store.remove(kept);
    expect(await store.open(kept, 4)).toBeUndefined();
  });
});
