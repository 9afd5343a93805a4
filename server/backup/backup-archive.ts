import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { mkdir, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import type { Writable } from 'node:stream';
import * as tar from 'tar';
import { z } from 'zod';
import type { PGlite } from '@electric-sql/pglite';
import { Worker } from 'node:worker_threads';
import { projectRoot } from '../project-paths';

/**
 * A Tuttiboard backup: one gzip-compressed tar archive (POSIX ustar, read by any `tar`) holding
 *
 *   manifest.json   what follows, with a SHA-256 (FIPS 180-4) and size for each part
 *   database.tar    the embedded database's data folder, as PGlite's dumpDataDir writes it
 *   files/…         every file the data folder keeps beside the database (instrument photos,
 *                   pass-off recordings, uploads waiting for their import commit, …)
 *
 * The manifest comes first, so a reader knows what to expect before it reads anything else.
 */
export const manifestName = 'manifest.json';
export const databaseName = 'database.tar';
export const filesFolder = 'files';

const sha256 = z.string().regex(/^[0-9a-f]{64}$/);
const manifestSchema = z.object({
  format: z.literal('tuttiboard-backup'),
  version: z.literal(1),
  createdAt: z.string(),
  database: z.object({ bytes: z.number().int().min(1), sha256 }),
  files: z.object({
    count: z.number().int().min(0),
    bytes: z.number().int().min(0),
    list: z.array(z.object({ path: z.string().min(1), bytes: z.number().int().min(0), sha256 })),
  }),
});

/** What a backup holds, as its manifest says. */
export type BackupManifest = z.infer<typeof manifestSchema>;

/** A backup file that cannot be restored; the message says why in one sentence. */
export class BackupArchiveError extends Error {}

/** The lock file and the database folder are not files kept beside the database. */
const notKeptFiles = new Set(['tutti.lock', 'pg']);

/**
 * Names in the data folder that a backup leaves out: the database itself (it goes in as
 * database.tar), the lock file, and the working folders of backups and restores (their names
 * start with a dot, or with `pg.before-restore-` for the database a restore set aside).
 */
function keptInBackup(topLevelName: string): boolean {
  return (
    !notKeptFiles.has(topLevelName) &&
    !topLevelName.startsWith('.') &&
    !topLevelName.startsWith('pg.before-restore-')
  );
}

/** Every regular file under a folder, as paths relative to it with '/' between the parts. */
function filesUnder(root: string, relative = ''): string[] {
  let entries: fs.Dirent[] = [];
  try {
    entries = fs.readdirSync(path.join(root, relative), { withFileTypes: true });
  } catch {
    return [];
  }
  const found: string[] = [];
  for (const entry of entries) {
    const child = relative ? `${relative}/${entry.name}` : entry.name;
    if (entry.isDirectory()) found.push(...filesUnder(root, child));
    else if (entry.isFile()) found.push(child);
  }
  return found.sort();
}

/**
 * The files a backup of this data folder holds, relative to it. Read synchronously: it runs
 * inside the snapshot's hold of the engine, where each await would wait a turn of the event
 * loop while every request waits for the engine.
 */
export function keptFiles(dataDir: string): string[] {
  let names: fs.Dirent[] = [];
  try {
    names = fs.readdirSync(dataDir, { withFileTypes: true });
  } catch {
    return [];
  }
  const found: string[] = [];
  for (const entry of names) {
    if (!keptInBackup(entry.name)) continue;
    if (entry.isDirectory()) found.push(...filesUnder(dataDir, entry.name));
    else if (entry.isFile()) found.push(entry.name);
  }
  return found.sort();
}

/**
 * Takes a consistent snapshot of the database and its files: answers the database image, and
 * leaves in `staging` (a fresh folder on the data folder's file system) files/ holding a hard
 * link to each kept file (a copy where links are not possible).
 *
 * Both are taken while the engine runs nothing else (PGlite's exclusive section, the one every
 * statement and dumpDataDir itself wait for), so no row can change between the two: a file is
 * written before the row that names it and removed after that row is deleted, hence every file a
 * row in the dump names is there to be linked. Files are never rewritten in place (each is
 * created once, with `wx`), so a link keeps the bytes as they were. A CHECKPOINT first writes
 * out every changed page, so the dump needs little or no recovery when it is opened.
 * Requests queue while the section runs; `snapshotMs` is how long it held the engine.
 */
export async function takeSnapshot(
  pglite: PGlite,
  dataDir: string,
  staging: string,
): Promise<{ image: ArrayBuffer; snapshotMs: number }> {
  await pglite.exec('CHECKPOINT');
  const filesStaging = path.join(staging, filesFolder);
  let image: Blob | undefined;
  let snapshotMs = 0;
  await pglite.runExclusive(async () => {
    const started = performance.now();
    // dumpDataDir's own body (PGlite 0.5): it takes the same exclusive section, which this
    // code already holds, so its inner step is called directly.
    const engine = pglite as unknown as {
      _checkReady(): Promise<void>;
      dataDir?: string;
      fs: { dumpTar(name: string, compression: 'none'): Promise<Blob> };
    };
    await engine._checkReady();
    image = await engine.fs.dumpTar(engine.dataDir?.split('/').pop() ?? 'pgdata', 'none');
    for (const relative of keptFiles(dataDir)) {
      const target = path.join(filesStaging, relative);
      fs.mkdirSync(path.dirname(target), { recursive: true });
      try {
        fs.linkSync(path.join(dataDir, relative), target);
      } catch {
        fs.copyFileSync(path.join(dataDir, relative), target);
      }
    }
    snapshotMs = performance.now() - started;
  });
  return { image: await image!.arrayBuffer(), snapshotMs };
}

const archiveName = 'backup.tar.gz';

/**
 * Hashes a staged snapshot, writes its manifest and packs it as `archiveName` in the staging
 * folder, on a worker thread (server/backup/backup-pack-worker.mjs says why).
 */
function packOnWorker(staging: string, image: ArrayBuffer): Promise<BackupManifest> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(path.join(projectRoot, 'server/backup/backup-pack-worker.mjs'), {
      workerData: { staging, image, databaseName, manifestName, filesFolder, archiveName },
      transferList: [image],
    });
    let settled = false;
    worker.once('message', (answer: { manifest?: unknown; error?: string }) => {
      settled = true;
      if (answer.error) reject(new Error(`The backup could not be packed: ${answer.error}`));
      else resolve(manifestSchema.parse(answer.manifest));
    });
    worker.once('error', (error) => {
      settled = true;
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`The backup packer stopped (exit code ${code}).`));
    });
  });
}

/** A working folder inside the data folder (same file system: links and renames work). */
export async function workingFolder(dataDir: string, kind: 'backup' | 'restore'): Promise<string> {
  await mkdir(dataDir, { recursive: true });
  const folder = path.join(
    dataDir,
    `.${kind}-${Date.now()}-${Math.random().toString(36).slice(2, 8)}`,
  );
  await mkdir(folder, { mode: 0o700 });
  return folder;
}

/**
 * Writes a backup of a running embedded database and its data folder's files: takes the
 * snapshot, packs it on a worker, then hands the manifest to `open` for the stream to write the
 * archive to (an HTTP answer sets its headers from it). Answers the manifest and how long the
 * engine was held. The archive is read in large chunks: each chunk waits a turn of the event
 * loop, and under load a turn is a whole round of requests.
 */
export async function writeBackup(
  pglite: PGlite,
  dataDir: string,
  open: (manifest: BackupManifest, snapshotMs: number) => Writable,
): Promise<{ manifest: BackupManifest; snapshotMs: number }> {
  const staging = await workingFolder(dataDir, 'backup');
  try {
    const { image, snapshotMs } = await takeSnapshot(pglite, dataDir, staging);
    const manifest = await packOnWorker(staging, image);
    await pipeline(
      fs.createReadStream(path.join(staging, archiveName), { highWaterMark: 4 * 1024 * 1024 }),
      open(manifest, snapshotMs),
    );
    return { manifest, snapshotMs };
  } finally {
    await rm(staging, { recursive: true, force: true });
  }
}

/** One line on what a backup holds, for the command line and the log. */
export function describeBackup(manifest: Pick<BackupManifest, 'database' | 'files'>): string {
  const files =
    manifest.files.count === 1 ? '1 file' : `${manifest.files.count.toLocaleString('en-US')} files`;
  return `the database (${manifest.database.bytes.toLocaleString('en-US')} bytes) and ${files} (${manifest.files.bytes.toLocaleString('en-US')} bytes)`;
}

/** A path inside the archive that may be written under the extraction folder. */
function safeEntryPath(entryPath: string): string | undefined {
  const normal = path.posix.normalize(entryPath.replace(/\/+$/, ''));
  if (normal === manifestName || normal === databaseName || normal === filesFolder) return normal;
  if (!normal.startsWith(`${filesFolder}/`) || normal.split('/').includes('..')) return undefined;
  return normal;
}

/**
 * Checks what an archive wrote out against its manifest: the database and every listed file
 * present with its size and SHA-256, nothing unlisted, each on disk at the size read. Throws
 * {@link BackupArchiveError} with one sentence otherwise.
 */
async function checkAgainstManifest(
  into: string,
  written: Map<string, { bytes: number; sha256: string }>,
): Promise<BackupManifest> {
  let manifest: BackupManifest;
  try {
    manifest = manifestSchema.parse(
      JSON.parse(fs.readFileSync(path.join(into, manifestName), 'utf8')),
    );
  } catch {
    throw new BackupArchiveError(
      `it has no readable ${manifestName}, so it is not a Tuttiboard backup`,
    );
  }
  const database = written.get(databaseName);
  if (!database) throw new BackupArchiveError(`it holds no ${databaseName}`);
  if (database.bytes !== manifest.database.bytes || database.sha256 !== manifest.database.sha256)
    throw new BackupArchiveError(`its ${databaseName} does not match the checksum in its manifest`);
  const listed = new Set<string>();
  for (const entry of manifest.files.list) {
    const name = `${filesFolder}/${entry.path}`;
    listed.add(name);
    const found = written.get(name);
    if (!found)
      throw new BackupArchiveError(`the file ${entry.path} its manifest lists is missing`);
    if (found.bytes !== entry.bytes || found.sha256 !== entry.sha256)
      throw new BackupArchiveError(
        `the file ${entry.path} does not match the checksum in its manifest`,
      );
  }
  const extra = [...written.keys()].find(
    (name) => name.startsWith(`${filesFolder}/`) && !listed.has(name),
  );
  if (extra) throw new BackupArchiveError(`it holds ${extra}, which its manifest does not list`);
  if (
    manifest.files.count !== manifest.files.list.length ||
    manifest.files.bytes !== manifest.files.list.reduce((total, entry) => total + entry.bytes, 0)
  )
    throw new BackupArchiveError('its manifest does not add up');
  // Written files are checked above from the bytes as they streamed past; make sure they are
  // all on disk at the sizes read.
  for (const [name, found] of written) {
    const onDisk = await stat(path.join(into, ...name.split('/'))).catch(() => undefined);
    if (onDisk?.size !== found.bytes)
      throw new BackupArchiveError(`${name} could not be written out whole`);
  }
  return manifest;
}

/**
 * Reads a backup archive into `into` (an empty folder) and checks it against its manifest (see
 * {@link checkAgainstManifest}), the archive whole to its end. Throws
 * {@link BackupArchiveError} with one sentence otherwise.
 */
export async function extractBackup(file: string, into: string): Promise<BackupManifest> {
  const problems: string[] = [];
  const written = new Map<string, { bytes: number; sha256: string }>();
  const writes: Promise<void>[] = [];
  const open = new Set<fs.WriteStream>();
  const onReadEntry = (entry: tar.ReadEntry) => {
    const safe = safeEntryPath(entry.path);
    if (!safe) {
      // Before backups held files, `tutti backup` wrote PGlite's bare data-folder dump.
      problems.push(
        /^(pg|pgdata)\//.test(entry.path)
          ? 'it is a database-only backup from an earlier version of Tuttiboard (no manifest); restore it with that version'
          : `it holds ${entry.path}, which a backup never does`,
      );
      return;
    }
    if (entry.type === 'Directory') return;
    if (entry.type !== 'File' && entry.type !== 'OldFile') {
      problems.push(`it holds ${entry.path} of type ${entry.type}, which a backup never does`);
      return;
    }
    if (written.has(safe)) {
      problems.push(`it holds ${safe} twice`);
      return;
    }
    const target = path.join(into, ...safe.split('/'));
    fs.mkdirSync(path.dirname(target), { recursive: true });
    const hash = createHash('sha256');
    let bytes = 0;
    const out = fs.createWriteStream(target, { flags: 'wx' });
    open.add(out);
    writes.push(
      new Promise<void>((resolve) => {
        out.on('close', resolve);
        out.on('error', (error) => {
          problems.push(`${safe} could not be written out (${error.message})`);
          resolve();
        });
      }),
    );
    entry.on('data', (chunk: Buffer) => {
      hash.update(chunk);
      bytes += chunk.length;
      out.write(chunk);
    });
    entry.on('end', () => {
      open.delete(out);
      out.end();
      written.set(safe, { bytes, sha256: hash.digest('hex') });
    });
  };
  let readError: unknown;
  try {
    await tar.t({ file, strict: true, onReadEntry });
  } catch (error) {
    readError = error;
  }
  // An archive that ends inside a file leaves that file's stream open.
  for (const out of open) out.destroy();
  await Promise.all(writes);
  if (readError)
    throw new BackupArchiveError(
      `it is not a whole .tar.gz archive (${describeReadError(readError)})`,
    );
  if (problems.length) throw new BackupArchiveError(problems[0]!);
  return checkAgainstManifest(into, written);
}

function describeReadError(error: unknown): string {
  const message = error instanceof Error ? error.message : String(error);
  if (/unexpected end|truncated|TAR_BAD_ARCHIVE|premature/i.test(message)) return 'it ends early';
  if (/incorrect header check|invalid|zlib|Z_DATA_ERROR|checksum/i.test(message))
    return 'its bytes are damaged';
  return message.split('\n')[0]!;
}
