/**
 * STL triangle meshes, ASCII and binary. The points are the mesh's vertices, each once: a mesh
 * lists a vertex once per triangle that uses it, and a fit must not count it six times.
 *
 * ASCII or binary is decided from the first bytes: ASCII starts with `solid` and continues as
 * text with `facet`; a binary file whose 80-byte header happens to start with `solid` is still
 * read as binary. A binary file must be exactly 84 + 50·n bytes for its n triangles.
 */
import { MeasureFileError } from './errors';
import { LineReader } from './lines';
import { parseDecimal, tokenText } from './numbers';
import { PointBuffer, type PointBufferOptions } from './pointBuffer';
import { splitFields } from './textPoints';
import type { ParsedCloud, StreamParser } from './types';

const SNIFF_BYTES = 512;
const HEADER = 84;
const RECORD = 50;

/** Is this the start of an ASCII STL? (`solid`, then printable text mentioning facet or endsolid) */
export function looksLikeAsciiStl(head: Uint8Array, complete: boolean): boolean {
  const solid = [0x73, 0x6f, 0x6c, 0x69, 0x64];
  let i = 0;
  while (i < head.length && (head[i] === 32 || head[i] === 9 || head[i] === 10 || head[i] === 13)) i++;
  for (let k = 0; k < 5; k++) if (head[i + k] !== solid[k]) return false;
  let text = '';
  for (let j = 0; j < head.length; j++) {
    const c = head[j]!;
    if (c === 0 || (c < 32 && c !== 9 && c !== 10 && c !== 13) || c > 126) return false;
    text += String.fromCharCode(c);
  }
  return /\bfacet\b|\bendsolid\b/.test(text) || (complete && head.length < HEADER);
}

export class StlParser implements StreamParser {
  private head = new Uint8Array(SNIFF_BYTES);
  private headLength = 0;
  private mode: 'ascii' | 'binary' | null = null;
  private buffer: PointBuffer;
  private readonly opts: PointBufferOptions;
  private offset = 0;
  // binary
  private triangles = 0;
  private triangleIndex = 0;
  private header = new Uint8Array(HEADER);
  private record = new Uint8Array(RECORD);
  private recordLength = 0;
  private extra = 0;
  // ascii
  private lineReader: LineReader | null = null;
  private state: 'start' | 'solid' | 'facet' | 'loop' | 'endloop' | 'end' = 'start';
  private verticesInLoop = 0;
  private facetLine = 0;
  private readonly starts = new Int32Array(8);
  private readonly ends = new Int32Array(8);

  constructor(opts: PointBufferOptions = {}) {
    this.opts = opts;
    this.buffer = new PointBuffer({ ...opts, unique: true });
  }

  get bytesRead(): number {
    return this.offset;
  }

  push(chunk: Uint8Array): void {
    if (this.mode === null) {
      const take = Math.min(chunk.length, SNIFF_BYTES - this.headLength);
      this.head.set(chunk.subarray(0, take), this.headLength);
      this.headLength += take;
      this.offset += take;
      chunk = chunk.subarray(take);
      if (this.headLength < SNIFF_BYTES) return;
      this.decide(false);
    }
    this.feed(chunk);
  }

  private decide(complete: boolean): void {
    const head = this.head.subarray(0, this.headLength);
    this.mode = looksLikeAsciiStl(head, complete) ? 'ascii' : 'binary';
    const savedOffset = this.offset;
    this.offset = 0;
    if (this.mode === 'ascii') {
      this.lineReader = new LineReader((b, s, e, line, off) => this.asciiLine(b, s, e, line, off), 'ASCII STL');
    }
    this.feed(head);
    this.offset = savedOffset;
  }

  private feed(chunk: Uint8Array): void {
    if (chunk.length === 0) return;
    if (this.mode === 'ascii') {
      this.lineReader!.push(chunk);
      this.offset += chunk.length;
      return;
    }
    this.pushBinary(chunk);
  }

  private pushBinary(chunk: Uint8Array): void {
    let i = 0;
    const n = chunk.length;
    const before = this.offset;
    if (before < HEADER) {
      const k = Math.min(HEADER - before, n);
      this.header.set(chunk.subarray(0, k), before);
      i = k;
      if (before + k === HEADER) {
        const view = new DataView(this.header.buffer, 0, HEADER);
        this.triangles = view.getUint32(80, true);
        this.startBinary();
      }
    }
    this.offset = before + i;
    if (i >= n) {
      this.offset = before + n;
      return;
    }
    const view = new DataView(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    if (this.recordLength > 0) {
      const k = Math.min(RECORD - this.recordLength, n - i);
      this.record.set(chunk.subarray(i, i + k), this.recordLength);
      this.recordLength += k;
      i += k;
      if (this.recordLength === RECORD) {
        this.triangleRecord(new DataView(this.record.buffer, 0, RECORD), 0);
        this.recordLength = 0;
      }
    }
    while (i + RECORD <= n && this.triangleIndex < this.triangles) {
      this.triangleRecord(view, i);
      i += RECORD;
    }
    if (i < n) {
      if (this.triangleIndex >= this.triangles) this.extra += n - i;
      else {
        this.record.set(chunk.subarray(i, n), 0);
        this.recordLength = n - i;
      }
    }
    this.offset = before + n;
  }

  private startBinary(): void {
    const max = this.buffer.maxPoints;
    // a closed mesh has about half as many vertices as triangles; refuse only what cannot fit
    if (this.triangles > max * 4) {
      throw new MeasureFileError(
        'measure.tooManyPoints',
        `The STL header announces ${this.triangles.toLocaleString('en-US')} triangles — far more vertices than the ${max.toLocaleString('en-US')} one upload may hold. Decimate the mesh and upload again.`,
        { byteOffset: 80 },
      );
    }
    this.buffer = new PointBuffer({ ...this.opts, unique: true, sizeHint: Math.min(this.triangles + 16, max) });
  }

  private triangleRecord(view: DataView, at: number): void {
    const buffer = this.buffer;
    for (let v = 0; v < 3; v++) {
      const o = at + 12 + v * 12;
      const x = view.getFloat32(o, true);
      const y = view.getFloat32(o + 4, true);
      const z = view.getFloat32(o + 8, true);
      if (x - x + (y - y) + (z - z) !== 0) {
        const axis = !Number.isFinite(x) ? 0 : !Number.isFinite(y) ? 1 : 2;
        const byteOffset = HEADER + this.triangleIndex * RECORD + 12 + v * 12 + axis * 4;
        throw new MeasureFileError(
          'measure.nonFinite',
          `Triangle ${this.triangleIndex}, vertex ${v + 1} (byte ${byteOffset}) has ${'xyz'[axis]} = ${String([x, y, z][axis])}; every coordinate must be a finite number.`,
          { byteOffset },
        );
      }
      buffer.add(x, y, z);
    }
    this.triangleIndex++;
  }

  private asciiLine(bytes: Uint8Array, start: number, end: number, line: number, byteOffset: number): void {
    const count = splitFields(bytes, start, end, this.starts, this.ends);
    if (count <= 0) return;
    const word = tokenText(bytes, this.starts[0]!, this.ends[0]!).toLowerCase();
    const fail = (expected: string): never => {
      throw new MeasureFileError('measure.syntax', `Line ${line}: expected ${expected}, found "${tokenText(bytes, start, end).trim()}".`, { line, byteOffset });
    };
    switch (this.state) {
      case 'start':
        if (word !== 'solid') fail('"solid"');
        this.state = 'solid';
        return;
      case 'solid':
        if (word === 'facet') {
          this.state = 'facet';
          this.facetLine = line;
          return;
        }
        if (word === 'endsolid') {
          this.state = 'end';
          return;
        }
        return fail('"facet" or "endsolid"');
      case 'facet':
        if (word !== 'outer') fail('"outer loop"');
        this.state = 'loop';
        this.verticesInLoop = 0;
        return;
      case 'loop':
        if (word === 'vertex') {
          if (count < 4) throw new MeasureFileError('measure.columns', `Line ${line}: a vertex needs x, y and z.`, { line, byteOffset });
          const v = [1, 2, 3].map((k) => {
            const s = this.starts[k]!;
            const e = this.ends[k]!;
            const value = parseDecimal(bytes, s, e);
            if (!Number.isFinite(value)) {
              const token = tokenText(bytes, s, e);
              const nonFinite = /^[+-]?(nan|inf)/i.test(token);
              throw new MeasureFileError(nonFinite ? 'measure.nonFinite' : 'measure.badNumber', `Line ${line}: "${token}" is not ${nonFinite ? 'a finite number' : 'a number'}.`, {
                line,
                byteOffset: byteOffset + (s - start),
              });
            }
            return value;
          });
          this.buffer.add(v[0]!, v[1]!, v[2]!);
          this.verticesInLoop++;
          return;
        }
        if (word === 'endloop') {
          if (this.verticesInLoop !== 3) {
            throw new MeasureFileError('measure.syntax', `Line ${line}: the facet from line ${this.facetLine} has ${this.verticesInLoop} vertices; a triangle has 3.`, { line, byteOffset });
          }
          this.state = 'endloop';
          return;
        }
        return fail('"vertex" or "endloop"');
      case 'endloop':
        if (word !== 'endfacet') fail('"endfacet"');
        this.triangleIndex++;
        this.state = 'solid';
        return;
      case 'end':
        // several solids in one file
        if (word === 'solid') {
          this.state = 'solid';
          return;
        }
        return fail('"solid" or the end of the file');
    }
  }

  end(): ParsedCloud {
    if (this.mode === null) {
      if (this.headLength === 0) throw new MeasureFileError('measure.empty', 'The file is empty.', { byteOffset: 0 });
      this.decide(true);
    }
    if (this.mode === 'ascii') {
      this.lineReader!.end();
      if (this.state !== 'end') {
        const lines = this.lineReader!.linesRead;
        throw new MeasureFileError(
          'measure.truncated',
          this.state === 'solid' || this.state === 'start'
            ? `The file ends at line ${lines} without "endsolid" — it was cut short.`
            : `The file ends at line ${lines} inside the facet that starts on line ${this.facetLine} — it was cut short.`,
          { line: lines, byteOffset: this.offset },
        );
      }
    } else {
      const expected = HEADER + this.triangles * RECORD;
      if (this.offset < HEADER) {
        throw new MeasureFileError('measure.truncated', `The file is ${this.offset} bytes: too short for a binary STL (84-byte header) and not ASCII STL text.`, { byteOffset: this.offset });
      }
      if (this.offset < expected) {
        throw new MeasureFileError(
          'measure.truncated',
          `The file ends at byte ${this.offset}, inside triangle ${this.triangleIndex} of ${this.triangles}: its header announces ${this.triangles} triangles, i.e. ${expected} bytes — it was cut short.`,
          { byteOffset: this.offset },
        );
      }
      if (this.extra > 0) {
        throw new MeasureFileError(
          'measure.syntax',
          `The file has ${this.extra} bytes after the ${this.triangles} triangles its header announces (expected ${expected} bytes, found ${this.offset}); the triangle count in the header is wrong or the file is not a binary STL.`,
          { byteOffset: expected },
        );
      }
    }
    if (this.buffer.count === 0) throw new MeasureFileError('measure.empty', 'The STL file has no triangles.', { byteOffset: 0 });
    return {
      format: 'stl',
      encoding: this.mode!,
      count: this.buffer.count,
      points: this.buffer.points(),
      bbox: this.buffer.bbox()!,
      labels: [],
      labelIndex: null,
      triangleCount: this.triangleIndex,
      columns: null,
      unitsFromHeader: null,
      bytesRead: this.offset,
    };
  }
}
