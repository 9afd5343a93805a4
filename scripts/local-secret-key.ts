import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

/**
 * The key a local `npm start` seals stored secrets with when TUTTI_SECRET_KEY is not set: made
 * once, kept in the data folder (readable by its owner only), the same on every later start.
 */
export function localSecretKey(dataDir: string): string {
  const file = path.join(path.resolve(dataDir), 'secret-key');
  if (fs.existsSync(file)) return fs.readFileSync(file, 'utf8').trim();
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const key = randomBytes(32).toString('base64url');
  fs.writeFileSync(file, `${key}\n`, { mode: 0o600, flag: 'wx' });
  return key;
}
