/**
 * Every rejection the domain makes is a DomainError: a stable code a program can branch on,
 * and a message a builder can act on. Never NaN, never a bare number.
 */
export class DomainError extends Error {
  readonly code: string;
  readonly path?: (string | number)[];

  constructor(code: string, message: string, path?: (string | number)[]) {
    super(message);
    this.name = 'DomainError';
    this.code = code;
    this.path = path;
  }
}

export function isDomainError(e: unknown): e is DomainError {
  return e instanceof DomainError;
}
