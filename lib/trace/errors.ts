/** A file that cannot be imported. The message names the first problem by row and column in plain words. */
export class TraceImportError extends Error {
  constructor(
    message: string,
    readonly row?: number,
    readonly column?: string,
  ) {
    super(message);
    this.name = "TraceImportError";
  }
}
