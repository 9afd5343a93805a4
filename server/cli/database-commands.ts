import type { Config } from '../config';
import { seedDemoWhenEmpty } from '../seed/demo';
import { demoDistrict } from '../seed/demo-people';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';

/** `tutti migrate`: applies every pending migration. */
export async function migrateCommand(config: Config, args: string[]): Promise<number> {
  if (args.length) throw new CommandError('migrate takes no arguments.');
  await withCommandDatabase(config, 'tutti migrate', async () => undefined);
  process.stdout.write('The database is migrated to the newest schema.\n');
  return 0;
}

/** `tutti seed --demo`: fills an empty database with the invented demo district. */
export async function seedCommand(config: Config, args: string[]): Promise<number> {
  if (args.length !== 1 || args[0] !== '--demo') throw new CommandError('seed needs --demo.');
  const seeded = await withCommandDatabase(config, 'tutti seed', ({ db }) => seedDemoWhenEmpty(db));
  process.stdout.write(
    seeded
      ? `Seeded the demo district, ${demoDistrict.name}.\n`
      : 'The database already holds a district; nothing was seeded.\n',
  );
  return 0;
}
