/** A failure the command explains itself; exit code 2 means the command or its file was bad. */
export class CommandError extends Error {
  constructor(
    message: string,
    readonly exitCode: 1 | 2 = 2,
    /** Whether the usage line follows the message (a wrong argument, not a bad file). */
    readonly showUsage = exitCode === 2,
  ) {
    super(message);
  }
}
