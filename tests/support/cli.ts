import { spawn } from 'node:child_process';
import path from 'node:path';

/** What a `tutti` run printed and how it ended. */
export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `node bin/tutti.js …` with the given environment (TUTTI_DATA_DIR above all). */
export function runTutti(
  args: string[],
  environment: NodeJS.ProcessEnv,
  input?: Buffer,
): Promise<CliResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [path.resolve('bin/tutti.js'), ...args], {
      env: { ...process.env, LOG_LEVEL: 'silent', ...environment },
      stdio: ['pipe', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code: code ?? -1, stdout, stderr }));
    child.stdin.end(input);
  });
}
