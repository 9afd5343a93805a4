/** A failure the command explains itself; exit code 2 means the command or its file was bad. */
export class CommandError extends Error {
  constructor(
    message: string,
    readonly exitCode: 1 | 2 = 2,
  ) {
    super(message);
  }
}
