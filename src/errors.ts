/**
 * One error type for everything a user can get wrong, so the CLI can print a
 * single line and pick the exit status from `kind`.
 */
export type ErrorKind = 'input' | 'range' | 'exists' | 'infeasible' | 'internal';

/** Exit statuses, documented in the README. */
export const EXIT = {
  ok: 0,
  internal: 1,
  input: 2,
  infeasible: 3,
} as const;

export class StackwrightError extends Error {
  readonly kind: ErrorKind;
  /** Where the problem is: `file.csv:12:5`, `spec.yaml: stacks[1].rout`, `--vds`, ... */
  readonly where?: string;
  constructor(message: string, opts: { kind?: ErrorKind; where?: string } = {}) {
    super(opts.where ? `${opts.where}: ${message}` : message);
    this.name = 'StackwrightError';
    this.kind = opts.kind ?? 'input';
    this.where = opts.where;
  }
}

export function exitCodeFor(err: unknown): number {
  if (err instanceof StackwrightError) {
    if (err.kind === 'infeasible') return EXIT.infeasible;
    if (err.kind === 'internal') return EXIT.internal;
    return EXIT.input;
  }
  return EXIT.internal;
}

/** Location string `file:line:column` (1-based line and column). */
export function at(file: string, line?: number, column?: number): string {
  if (line === undefined) return file;
  return column === undefined ? `${file}:${line}` : `${file}:${line}:${column}`;
}
