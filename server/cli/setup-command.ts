import type { Config } from '../config';
import { HttpError } from '../core/errors';
import {
  AlreadySetUpError,
  setUpDistrict,
  type SetupInput,
  type SetupResult,
} from '../district/district-service';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';
import { callRunningServer, runningServer } from './running-server';

const options = {
  '--district': 'district',
  '--coordinator': 'coordinator',
  '--coordinator-name': 'coordinatorName',
  '--time-zone': 'timeZone',
} as const;

/** Reads `--name value` (or `--name=value`) pairs; anything else is a bad command. */
export function parseSetupArguments(args: string[]): SetupInput {
  const input: Record<string, string> = {};
  for (let index = 0; index < args.length; index += 1) {
    const [flag, inline] = args[index]!.split(/=(.*)/s, 2) as [string, string | undefined];
    const field = options[flag as keyof typeof options];
    if (!field) throw new CommandError(`Unknown argument '${args[index]}'.`);
    const value = inline ?? args[(index += 1)];
    if (value === undefined) throw new CommandError(`${flag} needs a value.`);
    if (field in input) throw new CommandError(`${flag} is given twice.`);
    input[field] = value;
  }
  if (input['district'] === undefined)
    throw new CommandError("--district: give the district's name.");
  if (input['coordinator'] === undefined)
    throw new CommandError("--coordinator: give the first coordinator's e-mail address.");
  return input as unknown as SetupInput;
}

function report(config: Config, result: SetupResult): void {
  const { district, coordinator } = result;
  process.stdout.write(
    [
      `Set up ${district.name} (time zone ${district.timeZone}).`,
      `First coordinator: ${coordinator.name} <${coordinator.email}>.`,
      '',
      'Next:',
      `  1. Start the server (npm run serve) and open ${config.appUrl}.`,
      `  2. Sign in as ${coordinator.email} through the district's identity provider (${config.oidcIssuer}).`,
      '  3. Under Administration, open District settings: the short name, logo, office contact lines and mail sender.',
      '  4. Add the schools on the Schools screen, or import a roster (tutti import <file>), and create the school year.',
      '  5. Copy the starter scale ladder on the Scale ladder screen, and add the people who sign in on People.',
      '',
    ].join('\n'),
  );
}

/** Turns the service's refusals into the command's: exit 2 with the reason, nothing written. */
function asCommandError(error: unknown): never {
  if (error instanceof AlreadySetUpError) throw new CommandError(error.message, 2);
  if (error instanceof HttpError && error.status === 400) throw new CommandError(error.message, 2);
  throw error;
}

/**
 * `tutti setup --district "<name>" --coordinator <email> [--coordinator-name "<name>"]
 * [--time-zone <IANA>]`: makes the district and its first coordinator on a database with none.
 */
export async function setupCommand(config: Config, args: string[]): Promise<number> {
  const input = parseSetupArguments(args);
  const server = runningServer(config);
  if (server) {
    const answer = await callRunningServer<SetupResult & { error?: { message: string } }>(
      server,
      '/setup',
      {
        method: 'POST',
        body: JSON.stringify(input),
        contentType: 'application/json',
      },
    );
    if (answer.status === 400 || answer.status === 409)
      throw new CommandError(answer.body.error?.message ?? 'The setup was refused.', 2);
    if (answer.status !== 201)
      throw new CommandError(
        answer.body.error?.message ?? `The server answered ${answer.status}.`,
        1,
      );
    report(config, answer.body);
    return 0;
  }
  return withCommandDatabase(config, 'tutti setup', async ({ db }) => {
    const result = await setUpDistrict(db, input).catch(asCommandError);
    report(config, result);
    return 0;
  });
}
