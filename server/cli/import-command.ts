import type { Config } from '../config';
import { CommandError } from './command-error';

/** `tutti import`: wired to the roster import service. */
export async function importCommand(_config: Config, _args: string[]): Promise<number> {
  throw new CommandError('Roster import is not available in this build yet.', 1);
}
