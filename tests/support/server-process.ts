import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

/** A Tuttiboard server running as its own process, as `npm start` runs it. */
export interface ServerProcess {
  url: string;
  child: ChildProcess;
  /** The data folder lock's local key, for the local-command routes. */
  localKey: string;
  /** Stops it the hard way: no shutdown code runs. */
  kill(): Promise<void>;
  /** Stops it cleanly. */
  stop(): Promise<void>;
}

/** Starts `server/main.ts` on a free port over a data folder and waits until it answers. */
export async function startServerProcess(
  dataDir: string,
  environment: NodeJS.ProcessEnv = {},
): Promise<ServerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.resolve('server/main.ts')], {
    env: {
      ...process.env,
      TUTTI_DATA_DIR: dataDir,
      PORT: '0',
      LOG_LEVEL: 'info',
      OIDC_ISSUER: 'http://127.0.0.1:9',
      ...environment,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(
      () => reject(new Error(`The server did not start:\n${output}`)),
      60_000,
    );
    child.stdout!.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      const match = /"url":"(http:\/\/[^"]+)"/.exec(output);
      if (match) {
        clearTimeout(timer);
        resolve(match[1]!);
      }
    });
    child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.on('close', (code) => reject(new Error(`The server exited with ${code}:\n${output}`)));
  });
  const lock = JSON.parse(fs.readFileSync(path.join(dataDir, 'tutti.lock'), 'utf8')) as {
    localKey: string;
  };
  const ended = new Promise<void>((resolve) => child.on('close', () => resolve()));
  return {
    url: url.replace('localhost', '127.0.0.1'),
    child,
    localKey: lock.localKey,
    kill: async () => {
      child.kill('SIGKILL');
      await ended;
    },
    stop: async () => {
      child.kill('SIGTERM');
      await ended;
    },
  };
}
