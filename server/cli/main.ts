import { loadConfig, type Config } from '../config';
import { DataFolderLockedError } from '../db/data-lock';
import { tokenCommand } from './token-command';
import { backupCommand, restoreCommand } from './backup-command';
import { migrateCommand, seedCommand } from './database-commands';
import { importCommand } from './import-command';
import { CommandError } from './command-error';
import { setupCommand } from './setup-command';
import { yearCommand, yearUsage } from './year-command';

/** A `tutti` sub-command: takes its arguments, answers the exit code. */
export type Command = (config: Config, args: string[]) => Promise<number>;

const commands: Record<string, { run: Command; usage: string }> = {
  setup: {
    run: setupCommand,
    usage:
      'tutti setup --district "<name>" --coordinator <email> [--coordinator-name "<name>"] [--time-zone <IANA zone>]',
  },
  import: {
    run: importCommand,
    usage:
      'tutti import <file.csv | bundle.zip | folder> [--dry-run] [--json] [--skip-invalid]\n       tutti import --from-oneroster-api [--dry-run] [--json] [--skip-invalid]',
  },
  year: { run: yearCommand, usage: yearUsage },
  token: { run: tokenCommand, usage: 'tutti token <email>' },
  backup: { run: backupCommand, usage: 'tutti backup <file>' },
  restore: { run: restoreCommand, usage: 'tutti restore <file>' },
  seed: { run: seedCommand, usage: 'tutti seed --demo' },
  migrate: { run: migrateCommand, usage: 'tutti migrate' },
};

function usage(): string {
  return ['Usage:', ...Object.values(commands).map((command) => `  ${command.usage}`)].join('\n');
}

/** Runs the `tutti` command line; answers the process exit code (2 for a bad command). */
export async function main(argv: string[]): Promise<number> {
  const [name, ...args] = argv;
  if (!name || name === '--help' || name === 'help') {
    process.stdout.write(`${usage()}\n`);
    return name ? 0 : 2;
  }
  const command = commands[name];
  if (!command) {
    process.stderr.write(`tutti: unknown command '${name}'.\n${usage()}\n`);
    return 2;
  }
  try {
    return await command.run(loadConfig(), args);
  } catch (error) {
    if (error instanceof DataFolderLockedError) {
      process.stderr.write(`tutti ${name}: ${error.message}\n`);
      return 1;
    }
    if (error instanceof CommandError) {
      process.stderr.write(`tutti ${name}: ${error.message}\n`);
      if (error.showUsage) process.stderr.write(`Usage: ${command.usage}\n`);
      return error.exitCode;
    }
    process.stderr.write(
      `tutti ${name}: ${error instanceof Error ? error.message : String(error)}\n`,
    );
    return 1;
  }
}
