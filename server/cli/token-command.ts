import type { Config } from '../config';
import { findUserByEmail } from '../people/people-queries';
import { issueToken } from '../tokens/token-service';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';

/** `tutti token <email>`: prints a new API token for that user, alone on the last line. */
export async function tokenCommand(config: Config, args: string[]): Promise<number> {
  const email = args.find((arg) => !arg.startsWith('--'));
  if (!email || args.length !== 1) throw new CommandError('Give exactly one e-mail address.');
  return withCommandDatabase(config, `tutti token ${email}`, async ({ db }) => {
    const user = await findUserByEmail(db, email);
    if (!user || !user.active) throw new CommandError(`No active user has the e-mail ${email}.`, 1);
    const { token } = await issueToken(db, user.id, 'tutti token');
    process.stdout.write(`A new API token for ${user.name} (${user.role}). Send it as "Authorization: Bearer <token>". It is shown only once:\n${token}\n`);
    return 0;
  });
}
