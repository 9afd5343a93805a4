import type { Config } from '../config';
import { findUserByEmail } from '../people/people-queries';
import { issueToken } from '../tokens/tokens-service';
import { defaultTokenLifetimeDays } from '@shared/api/token';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';
import { callRunningServer, runningServer } from './running-server';

function printToken(name: string, role: string, token: string, expiresAt: string) {
  process.stdout.write(
    `A new API token for ${name} (${role}), valid until ${expiresAt.slice(0, 10)} (${defaultTokenLifetimeDays} days). Send it as "Authorization: Bearer <token>". It is shown only once:\n${token}\n`,
  );
}

/** `tutti token <email>`: prints a new API token for that user, alone on the last line. */
export async function tokenCommand(config: Config, args: string[]): Promise<number> {
  const email = args.find((arg) => !arg.startsWith('--'));
  if (!email || args.length !== 1) throw new CommandError('Give exactly one e-mail address.');
  const server = runningServer(config);
  if (server) {
    const answer = await callRunningServer<{
      token: string;
      name: string;
      role: string;
      expiresAt: string;
      error?: { message: string };
    }>(server, '/tokens', {
      method: 'POST',
      body: JSON.stringify({ email }),
      contentType: 'application/json',
    });
    if (answer.status !== 201)
      throw new CommandError(
        answer.body.error?.message ?? `The server answered ${answer.status}.`,
        1,
      );
    printToken(answer.body.name, answer.body.role, answer.body.token, answer.body.expiresAt);
    return 0;
  }
  return withCommandDatabase(config, `tutti token ${email}`, async ({ db }) => {
    const user = await findUserByEmail(db, email);
    if (!user || !user.active) throw new CommandError(`No active user has the e-mail ${email}.`, 1);
    const { token, expiresAt } = await issueToken(db, user.id, 'tutti token');
    printToken(user.name, user.role, token, expiresAt.toISOString());
    return 0;
  });
}
