// Packs a staged backup snapshot on a worker thread (see backup-archive.ts, packOnWorker):
// writes database.tar from the bytes it is handed, hashes every part (SHA-256, FIPS 180-4),
// writes manifest.json, and compresses all of it into one .tar.gz. Compression level 1: on the
// demo district's database it took a third of level 6's time for an archive 18 % larger. On the server's own thread
// each chunk of this work waits for a turn of the event loop, which under load is a whole round
// of requests; here it runs on its own loop and the second core, while the server answers.
// Plain JavaScript so that the same file runs under tsx and beside the production bundle.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import { parentPort, workerData } from 'node:worker_threads';
import * as tar from 'tar';

const { staging, image, databaseName, manifestName, filesFolder, archiveName } = workerData;

function filesUnder(root, relative = '') {
  const found = [];
  let entries = [];
  try {
    entries = fs.readdirSync(path.join(root, relative), { withFileTypes: true });
  } catch {
    return found;
  }
  for (const entry of entries) {
    const child = relative ? `${relative}/${entry.name}` : entry.name;
    if (entry.isDirectory()) found.push(...filesUnder(root, child));
    else if (entry.isFile()) found.push(child);
  }
  return found.sort();
}

async function hashFile(file) {
  const hash = createHash('sha256');
  let bytes = 0;
  for await (const chunk of fs.createReadStream(file, { highWaterMark: 4 * 1024 * 1024 })) {
    hash.update(chunk);
    bytes += chunk.length;
  }
  return { bytes, sha256: hash.digest('hex') };
}

async function pack() {
  const databaseBytes = new Uint8Array(image);
  fs.writeFileSync(path.join(staging, databaseName), databaseBytes);
  const database = {
    bytes: databaseBytes.byteLength,
    sha256: createHash('sha256').update(databaseBytes).digest('hex'),
  };
  const filesRoot = path.join(staging, filesFolder);
  const list = [];
  for (const relative of filesUnder(filesRoot))
    list.push({ path: relative, ...(await hashFile(path.join(filesRoot, relative))) });
  const manifest = {
    format: 'tuttiboard-backup',
    version: 1,
    createdAt: new Date().toISOString(),
    database,
    files: { count: list.length, bytes: list.reduce((total, file) => total + file.bytes, 0), list },
  };
  fs.writeFileSync(path.join(staging, manifestName), JSON.stringify(manifest, null, 2));
  const parts = [manifestName, databaseName];
  if (fs.existsSync(filesRoot)) parts.push(filesFolder);
  await pipeline(
    tar.c({ gzip: { level: 1 }, cwd: staging, portable: true }, parts),
    fs.createWriteStream(path.join(staging, archiveName)),
  );
  return manifest;
}

pack().then(
  (manifest) => parentPort.postMessage({ manifest }),
  (error) => parentPort.postMessage({ error: error instanceof Error ? error.message : String(error) }),
);
