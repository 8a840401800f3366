/**
 * Splits a byte stream into lines for the text formats, across chunk boundaries. Lines end with
 * LF, CRLF or CR; a line's bytes are handed over as (bytes, start, end) without copying, except
 * the one line that straddles two chunks. Tracks the 1-based line number and the byte offset of
 * each line's start.
 */
import { MeasureFileError } from './errors';

export type LineHandler = (bytes: Uint8Array, start: number, end: number, line: number, byteOffset: number) => void;

const LF = 10;
const CR = 13;

export const MAX_LINE_BYTES = 4096;

export class LineReader {
  private carry = new Uint8Array(256);
  private carryLength = 0;
  private lineNo: number;
  /** offset in the file of the next byte to be read */
  private offset: number;
  private lastWasCR = false;

  /** `startOffset` / `startLine`: where in the file the first byte pushed sits (after a header) */
  constructor(
    private readonly onLine: LineHandler,
    private readonly what: string,
    startOffset = 0,
    startLine = 0,
  ) {
    this.offset = startOffset;
    this.lineNo = startLine;
  }

  get linesRead(): number {
    return this.lineNo;
  }

  get bytesRead(): number {
    return this.offset;
  }

  push(chunk: Uint8Array): void {
    let start = 0;
    let i = 0;
    const n = chunk.length;
    if (this.lastWasCR && i < n && chunk[i] === LF) {
      // second half of a CRLF split across chunks
      i++;
      start = i;
    }
    this.lastWasCR = false;
    for (; i < n; i++) {
      const c = chunk[i]!;
      if (c !== LF && c !== CR) continue;
      this.emit(chunk, start, i);
      if (c === CR) {
        if (i + 1 < n) {
          if (chunk[i + 1] === LF) i++;
        } else this.lastWasCR = true;
      }
      start = i + 1;
    }
    if (start < n) this.keepTail(chunk, start, n);
    this.offset += n;
  }

  /** Call at the end of the file: the last line may have no line break. */
  end(): void {
    if (this.carryLength > 0) {
      const lineStart = this.offset - this.carryLength;
      this.lineNo++;
      this.onLine(this.carry, 0, this.carryLength, this.lineNo, lineStart);
      this.carryLength = 0;
    }
  }

  private emit(chunk: Uint8Array, start: number, end: number): void {
    this.lineNo++;
    if (this.carryLength > 0) {
      this.append(chunk, start, end);
      const len = this.carryLength;
      this.carryLength = 0;
      this.onLine(this.carry, 0, len, this.lineNo, this.offset + end - len);
      return;
    }
    if (end - start > MAX_LINE_BYTES) this.tooLong(this.offset + start);
    this.onLine(chunk, start, end, this.lineNo, this.offset + start);
  }

  private keepTail(chunk: Uint8Array, start: number, end: number): void {
    this.append(chunk, start, end);
  }

  private append(chunk: Uint8Array, start: number, end: number): void {
    const len = this.carryLength + (end - start);
    if (len > MAX_LINE_BYTES) this.tooLong(this.offset - this.carryLength);
    if (len > this.carry.length) {
      const next = new Uint8Array(Math.min(MAX_LINE_BYTES, Math.max(len, this.carry.length * 2)));
      next.set(this.carry.subarray(0, this.carryLength));
      this.carry = next;
    }
    this.carry.set(chunk.subarray(start, end), this.carryLength);
    this.carryLength = len;
  }

  private tooLong(byteOffset: number): never {
    throw new MeasureFileError(
      'measure.syntax',
      `Line ${this.lineNo + (this.carryLength > 0 ? 1 : 0)} (from byte ${byteOffset}) is longer than ${MAX_LINE_BYTES} characters — this does not look like a ${this.what} file.`,
      { line: this.lineNo + 1, byteOffset },
    );
  }
}
