/**
 * Rejections of a measurement file. Every one names where the file went wrong: the line (text
 * formats, 1-based) or the byte offset (binary formats, 0-based), so a builder can open the file
 * and look. `tooManyPoints` and `tooLarge` are limits, not defects of the file.
 */
import { DomainError } from '../errors';

export type MeasureErrorCode =
  | 'measure.empty'
  | 'measure.notText'
  | 'measure.formatMismatch'
  | 'measure.unsupported'
  | 'measure.header'
  | 'measure.badNumber'
  | 'measure.nonFinite'
  | 'measure.columns'
  | 'measure.truncated'
  | 'measure.syntax'
  | 'measure.tooManyPoints';

export interface MeasureErrorWhere {
  /** 1-based line of a text file */
  readonly line?: number;
  /** 0-based byte offset in the file */
  readonly byteOffset?: number;
}

export class MeasureFileError extends DomainError {
  readonly line?: number;
  readonly byteOffset?: number;

  constructor(code: MeasureErrorCode, message: string, where: MeasureErrorWhere = {}) {
    super(code, message, where.line !== undefined ? ['line', where.line] : where.byteOffset !== undefined ? ['byte', where.byteOffset] : undefined);
    this.name = 'MeasureFileError';
    this.line = where.line;
    this.byteOffset = where.byteOffset;
  }
}

export function isMeasureFileError(e: unknown): e is MeasureFileError {
  return e instanceof MeasureFileError;
}
