/** A usage or input error of the command line: printed as one line, exit status 2 unless given. */
export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode = 2,
  ) {
    super(message);
  }
}
