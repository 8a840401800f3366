/**
 * ASCII point lists: XYZ (x y z per line, spaces or tabs) and CSV (x,y,z[,label], commas or
 * semicolons), fed chunk by chunk.
 *
 * - Blank lines and lines starting with `#` or `//` are skipped.
 * - The first content line may be a header naming the columns (`x,y,z,label`, `X [mm];Y;Z`);
 *   without one, columns are x, y, z, then an optional label. A label is a short text naming the
 *   feature a probed point belongs to (`H1`, `BORE`); numeric extra columns (intensity, colour,
 *   normals) are ignored.
 * - Every value must be a finite decimal number: `nan`, `inf`, `1,5` (decimal comma) or text is
 *   rejected with its line and column.
 */
import { MeasureFileError } from './errors';
import { LineReader } from './lines';
import { parseDecimal, tokenText } from './numbers';
import { PointBuffer, type PointBufferOptions } from './pointBuffer';
import type { ParsedCloud, StreamParser } from './types';
import type { LengthUnit } from '../units';

const SPACE = 32;
const TAB = 9;
const COMMA = 44;
const SEMI = 59;
const QUOTE = 34;
const HASH = 35;
const SLASH = 47;

const MAX_FIELDS = 32;
const MAX_LABEL_LENGTH = 32;

export type Delimiter = 'space' | 'comma' | 'semicolon';

/** The delimiter of a file, from its first content line: ";" if it has one, else ",", else spaces. */
export function delimiterOf(bytes: Uint8Array, start: number, end: number): Delimiter {
  let comma = false;
  for (let i = start; i < end; i++) {
    if (bytes[i] === SEMI) return 'semicolon';
    if (bytes[i] === COMMA) comma = true;
  }
  return comma ? 'comma' : 'space';
}

/**
 * Splits a line into fields. With 'space', runs of spaces and tabs separate (and a single comma
 * or semicolon between values is accepted too); with 'comma' or 'semicolon', only that character
 * separates and spaces around a field are trimmed ("X [mm]" stays one field, and in a
 * semicolon file "1,5" stays one — a decimal comma). Returns the number of fields, or −(k + 1)
 * when field k is empty. Quotes around a field are removed.
 */
export function splitFields(bytes: Uint8Array, start: number, end: number, starts: Int32Array, ends: Int32Array, delimiter: Delimiter = 'space'): number {
  if (delimiter === 'space') return splitOnSpace(bytes, start, end, starts, ends);
  const sep = delimiter === 'comma' ? COMMA : SEMI;
  let count = 0;
  let i = start;
  while (i <= end) {
    // one field: up to the next separator
    let j = i;
    if (j < end && bytes[j] === QUOTE) {
      j++;
      while (j < end && bytes[j] !== QUOTE) j++;
      j++;
    }
    while (j < end && bytes[j] !== sep) j++;
    let s = i;
    let e = j;
    while (s < e && (bytes[s] === SPACE || bytes[s] === TAB)) s++;
    while (e > s && (bytes[e - 1] === SPACE || bytes[e - 1] === TAB)) e--;
    if (e - s >= 2 && bytes[s] === QUOTE && bytes[e - 1] === QUOTE) {
      s++;
      e--;
    }
    if (count >= MAX_FIELDS) return count;
    if (s === e) {
      // an empty last field (a trailing separator) is allowed; an empty field elsewhere is not
      if (j >= end && count > 0) return count;
      if (j >= end && count === 0) return 0;
      return -(count + 1);
    }
    starts[count] = s;
    ends[count] = e;
    count++;
    i = j + 1;
  }
  return count;
}

function splitOnSpace(bytes: Uint8Array, start: number, end: number, starts: Int32Array, ends: Int32Array): number {
  let count = 0;
  let i = start;
  let delimiters = 0;
  while (i < end) {
    const c = bytes[i]!;
    if (c === SPACE || c === TAB) {
      i++;
      continue;
    }
    if (c === COMMA || c === SEMI) {
      delimiters++;
      if (delimiters > (count === 0 ? 0 : 1)) return -(count + 1);
      i++;
      continue;
    }
    if (count >= MAX_FIELDS) return count;
    if (c === QUOTE) {
      let j = i + 1;
      while (j < end && bytes[j] !== QUOTE) j++;
      starts[count] = i + 1;
      ends[count] = j;
      count++;
      i = j + 1;
    } else {
      let j = i;
      while (j < end) {
        const d = bytes[j]!;
        if (d === SPACE || d === TAB || d === COMMA || d === SEMI) break;
        j++;
      }
      starts[count] = i;
      ends[count] = j;
      count++;
      i = j;
    }
    delimiters = 0;
  }
  return count;
}

function isComment(bytes: Uint8Array, start: number, end: number): boolean {
  let i = start;
  while (i < end && (bytes[i] === SPACE || bytes[i] === TAB)) i++;
  if (i >= end) return true;
  if (bytes[i] === HASH) return true;
  return bytes[i] === SLASH && i + 1 < end && bytes[i + 1] === SLASH;
}

function text(bytes: Uint8Array, start: number, end: number): string {
  let s = '';
  for (let i = start; i < end; i++) s += String.fromCharCode(bytes[i]!);
  return s;
}

const NON_FINITE_RE = /^[+-]?(nan|inf|infinity|1\.#inf|1\.#ind|-?1\.#qnan)$/i;

function columnProblem(line: number, column: number, token: string, byteOffset: number): MeasureFileError {
  if (NON_FINITE_RE.test(token)) {
    return new MeasureFileError('measure.nonFinite', `Line ${line}, column ${column}: "${token}" is not a finite number; remove that point or give its value.`, { line, byteOffset });
  }
  if (/^[+-]?\d+,\d+$/.test(token)) {
    return new MeasureFileError('measure.badNumber', `Line ${line}, column ${column}: "${token}" uses a decimal comma; write decimals with a point (12.5).`, { line, byteOffset });
  }
  return new MeasureFileError('measure.badNumber', `Line ${line}, column ${column}: "${token}" is not a number.`, { line, byteOffset });
}

export interface TextColumns {
  x: number;
  y: number;
  z: number;
  /** −1: none */
  label: number;
  header: string[] | null;
  unitsFromHeader: LengthUnit | null;
}

function headerColumns(names: string[], line: number, byteOffset: number): TextColumns {
  const cols: TextColumns = { x: -1, y: -1, z: -1, label: -1, header: names, unitsFromHeader: null };
  names.forEach((raw, i) => {
    const name = raw.trim().toLowerCase();
    const axis = /^(?:point[ _-]?)?([xyz])(?:$|[^a-z])/.exec(name)?.[1];
    if (axis && (cols as unknown as Record<string, number>)[axis] === -1) (cols as unknown as Record<string, number>)[axis] = i;
    else if (cols.label === -1 && /^(label|name|id|feature|point|tag)$/.test(name)) cols.label = i;
    if (axis) {
      if (/\bmm\b|\(mm\)|\[mm\]|_mm$/.test(name)) cols.unitsFromHeader = 'mm';
      else if (/\bin\b|\(in\)|\[in\]|_in$|inch/.test(name)) cols.unitsFromHeader = 'in';
    }
  });
  if (cols.x < 0 || cols.y < 0 || cols.z < 0) {
    const missing = (['x', 'y', 'z'] as const).filter((a) => cols[a] < 0).join(', ');
    throw new MeasureFileError(
      'measure.header',
      `Line ${line} looks like a header (${names.map((n) => `"${n}"`).join(', ')}) but names no ${missing} column; name the columns x, y, z (and optionally label), or remove the header.`,
      { line, byteOffset },
    );
  }
  return cols;
}

export class TextPointParser implements StreamParser {
  private readonly buffer: PointBuffer;
  private readonly reader: LineReader;
  private readonly starts = new Int32Array(MAX_FIELDS);
  private readonly ends = new Int32Array(MAX_FIELDS);
  private columns: TextColumns | null = null;
  private minFields = 3;
  private currentLine = 0;
  /** from the first content line (see `delimiterOf`) */
  private delimiter: Delimiter | null = null;

  constructor(
    private readonly format: 'xyz' | 'csv',
    opts: PointBufferOptions = {},
  ) {
    this.buffer = new PointBuffer({ ...opts, where: () => ` (at line ${this.currentLine})` });
    this.reader = new LineReader((b, s, e, line, off) => this.line(b, s, e, line, off), format === 'csv' ? 'CSV point' : 'XYZ point');
  }

  get bytesRead(): number {
    return this.reader.bytesRead;
  }

  push(chunk: Uint8Array): void {
    this.reader.push(chunk);
  }

  private line(bytes: Uint8Array, start: number, end: number, line: number, byteOffset: number): void {
    this.currentLine = line;
    if (isComment(bytes, start, end)) return;
    const { starts, ends } = this;
    this.delimiter ??= delimiterOf(bytes, start, end);
    const count = splitFields(bytes, start, end, starts, ends, this.delimiter);
    if (count < 0) {
      throw new MeasureFileError('measure.columns', `Line ${line}, column ${-count} is empty (two separators in a row).`, { line, byteOffset });
    }
    if (count === 0) return;
    if (this.columns === null) {
      const first = parseDecimal(bytes, starts[0]!, ends[0]!);
      if (Number.isNaN(first) && !NON_FINITE_RE.test(text(bytes, starts[0]!, ends[0]!))) {
        const names: string[] = [];
        for (let k = 0; k < count; k++) names.push(text(bytes, starts[k]!, ends[k]!));
        this.columns = headerColumns(names, line, byteOffset);
        this.minFields = Math.max(this.columns.x, this.columns.y, this.columns.z) + 1;
        return;
      }
      this.columns = { x: 0, y: 1, z: 2, label: 3, header: null, unitsFromHeader: null };
    }
    const cols = this.columns;
    if (count < this.minFields) {
      throw new MeasureFileError(
        'measure.columns',
        `Line ${line} has ${count} value${count === 1 ? '' : 's'}; every point needs x, y and z${cols.header ? ` (columns ${cols.x + 1}, ${cols.y + 1}, ${cols.z + 1})` : ''}.`,
        { line, byteOffset },
      );
    }
    const x = this.value(bytes, cols.x, line, byteOffset, start);
    const y = this.value(bytes, cols.y, line, byteOffset, start);
    const z = this.value(bytes, cols.z, line, byteOffset, start);
    const index = this.buffer.add(x, y, z);
    if (cols.label >= 0 && cols.label < count) {
      const ls = starts[cols.label]!;
      const le = ends[cols.label]!;
      if (le > ls && (cols.header !== null || Number.isNaN(parseDecimal(bytes, ls, le)))) {
        const label = text(bytes, ls, Math.min(le, ls + MAX_LABEL_LENGTH)).trim();
        if (label) this.buffer.setLabel(index, label);
      }
    }
  }

  private value(bytes: Uint8Array, col: number, line: number, byteOffset: number, lineStart: number): number {
    const s = this.starts[col]!;
    const e = this.ends[col]!;
    const v = parseDecimal(bytes, s, e);
    if (Number.isFinite(v)) return v;
    throw columnProblem(line, col + 1, tokenText(bytes, s, e), byteOffset + (s - lineStart));
  }

  end(): ParsedCloud {
    this.reader.end();
    if (this.buffer.count === 0) {
      throw new MeasureFileError('measure.empty', `The file holds no points (${this.reader.linesRead} line${this.reader.linesRead === 1 ? '' : 's'}, none with x, y, z).`);
    }
    const labels = this.buffer.labels();
    return {
      format: this.format,
      encoding: 'ascii',
      count: this.buffer.count,
      points: this.buffer.points(),
      bbox: this.buffer.bbox()!,
      labels: labels.names,
      labelIndex: labels.index,
      triangleCount: null,
      columns: this.columns?.header ?? null,
      unitsFromHeader: this.columns?.unitsFromHeader ?? null,
      bytesRead: this.reader.bytesRead,
    };
  }
}
