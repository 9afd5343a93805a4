import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

/** The folder recordings are kept in, under the data folder. */
export function recordingsFolder(dataDir: string): string {
  return path.join(dataDir, 'recordings');
}

// Stored names are ours alone (random hex), so a path never comes from an upload.
const storedNamePattern = /^[0-9a-f]{32}$/;

/** The path of a stored recording; throws on a name that is not one of ours. */
export function recordingPath(dataDir: string, storedName: string): string {
  if (!storedNamePattern.test(storedName)) throw new Error('Not a stored recording name.');
  return path.join(recordingsFolder(dataDir), storedName);
}

/** Writes a recording's bytes under a new random name and answers the name. */
export function writeRecordingFile(dataDir: string, bytes: Uint8Array): string {
  const storedName = randomBytes(16).toString('hex');
  fs.mkdirSync(recordingsFolder(dataDir), { recursive: true });
  fs.writeFileSync(recordingPath(dataDir, storedName), bytes, { flag: 'wx' });
  return storedName;
}

/** Removes a stored recording's file, if it is there. */
export function removeRecordingFile(dataDir: string, storedName: string): void {
  fs.rmSync(recordingPath(dataDir, storedName), { force: true });
}
