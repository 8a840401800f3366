/**
 * PLY point clouds and meshes (ASCII and binary little-endian): the header is read, then only
 * the vertex element's x, y, z are kept; faces and other elements after the vertices are not
 * needed for fitting and are not read. Binary vertices are decoded straight from the chunks
 * with a DataView — no per-point objects.
 */
import { MeasureFileError } from './errors';
import { LineReader } from './lines';
import { parseDecimal, tokenText } from './numbers';
import { PointBuffer, type PointBufferOptions } from './pointBuffer';
import { splitFields } from './textPoints';
import type { ParsedCloud, StreamParser } from './types';

const MAX_HEADER_BYTES = 65536;

type ScalarType = 'int8' | 'uint8' | 'int16' | 'uint16' | 'int32' | 'uint32' | 'float32' | 'float64';

const TYPE_ALIASES: Record<string, ScalarType> = {
  char: 'int8',
  int8: 'int8',
  uchar: 'uint8',
  uint8: 'uint8',
  short: 'int16',
  int16: 'int16',
  ushort: 'uint16',
  uint16: 'uint16',
  int: 'int32',
  int32: 'int32',
  uint: 'uint32',
  uint32: 'uint32',
  float: 'float32',
  float32: 'float32',
  double: 'float64',
  float64: 'float64',
};

const TYPE_SIZE: Record<ScalarType, number> = { int8: 1, uint8: 1, int16: 2, uint16: 2, int32: 4, uint32: 4, float32: 4, float64: 8 };

interface PlyProperty {
  name: string;
  type: ScalarType | null;
  list: boolean;
}

interface PlyElement {
  name: string;
  count: number;
  properties: PlyProperty[];
  headerLine: number;
}

export interface PlyHeader {
  encoding: 'ascii' | 'binary';
  elements: PlyElement[];
  comments: string[];
  /** bytes of the header, i.e. offset of the first data byte */
  length: number;
  lines: number;
}

type Reader = (view: DataView, offset: number) => number;

function readerFor(type: ScalarType): Reader {
  switch (type) {
    case 'int8':
      return (v, o) => v.getInt8(o);
    case 'uint8':
      return (v, o) => v.getUint8(o);
    case 'int16':
      return (v, o) => v.getInt16(o, true);
    case 'uint16':
      return (v, o) => v.getUint16(o, true);
    case 'int32':
      return (v, o) => v.getInt32(o, true);
    case 'uint32':
      return (v, o) => v.getUint32(o, true);
    case 'float32':
      return (v, o) => v.getFloat32(o, true);
    case 'float64':
      return (v, o) => v.getFloat64(o, true);
  }
}

function headerError(message: string, line: number): MeasureFileError {
  return new MeasureFileError('measure.header', `PLY header, line ${line}: ${message}`, { line });
}

/** Parses the header text (everything up to and including the `end_header` line). */
export function parsePlyHeader(textHeader: string, length: number): PlyHeader {
  const lines = textHeader.split(/\r\n|\r|\n/);
  if (lines[0]?.trim() !== 'ply') throw headerError('a PLY file starts with the line "ply".', 1);
  let encoding: 'ascii' | 'binary' | null = null;
  const elements: PlyElement[] = [];
  const comments: string[] = [];
  let lineCount = 0;
  for (let i = 1; i < lines.length; i++) {
    const lineNo = i + 1;
    const raw = lines[i]!;
    const words = raw.trim().split(/\s+/);
    const key = words[0] ?? '';
    if (key === '') continue;
    if (key === 'end_header') {
      lineCount = lineNo;
      break;
    }
    if (key === 'comment' || key === 'obj_info') {
      comments.push(raw.trim().slice(key.length).trim());
      continue;
    }
    if (key === 'format') {
      const f = words[1];
      if (f === 'ascii') encoding = 'ascii';
      else if (f === 'binary_little_endian') encoding = 'binary';
      else if (f === 'binary_big_endian') {
        throw new MeasureFileError('measure.unsupported', `PLY header, line ${lineNo}: binary big-endian PLY is not read; export as binary little-endian or ASCII PLY.`, { line: lineNo });
      } else throw headerError(`unknown format "${f ?? ''}"; expected ascii or binary_little_endian.`, lineNo);
      continue;
    }
    if (key === 'element') {
      const count = Number(words[2]);
      if (!words[1] || !Number.isSafeInteger(count) || count < 0) throw headerError(`"${raw.trim()}" needs a name and a whole count ("element vertex 1000").`, lineNo);
      elements.push({ name: words[1], count, properties: [], headerLine: lineNo });
      continue;
    }
    if (key === 'property') {
      const el = elements[elements.length - 1];
      if (!el) throw headerError('a property comes before any element.', lineNo);
      if (words[1] === 'list') {
        if (words.length < 5 || !TYPE_ALIASES[words[2]!] || !TYPE_ALIASES[words[3]!]) throw headerError(`"${raw.trim()}" is not a valid list property.`, lineNo);
        el.properties.push({ name: words[4]!, type: null, list: true });
      } else {
        const type = TYPE_ALIASES[words[1] ?? ''];
        if (!type || !words[2]) throw headerError(`"${raw.trim()}": unknown property type "${words[1] ?? ''}".`, lineNo);
        el.properties.push({ name: words[2], type, list: false });
      }
      continue;
    }
    throw headerError(`unexpected "${raw.trim().slice(0, 40)}".`, lineNo);
  }
  if (encoding === null) throw headerError('no "format" line.', 2);
  return { encoding, elements, comments, length, lines: lineCount };
}

export class PlyParser implements StreamParser {
  private headerBytes = new Uint8Array(1024);
  private headerLength = 0;
  private header: PlyHeader | null = null;
  private buffer: PointBuffer;
  private readonly opts: PointBufferOptions;
  private offset = 0;
  // binary state
  private skipBytes = 0;
  private remaining = 0;
  private vertexTotal = 0;
  private stride = 0;
  private offsets: [number, number, number] = [0, 0, 0];
  private readers: [Reader, Reader, Reader] | null = null;
  private pending = new Uint8Array(0);
  private pendingLength = 0;
  private vertexStart = 0;
  // ascii state
  private lineReader: LineReader | null = null;
  private skipLines = 0;
  private columnsOf: [number, number, number] = [0, 1, 2];
  private propertyCount = 0;
  private readonly starts = new Int32Array(64);
  private readonly ends = new Int32Array(64);

  constructor(opts: PointBufferOptions = {}) {
    this.opts = opts;
    this.buffer = new PointBuffer(opts);
  }

  get bytesRead(): number {
    return this.offset;
  }

  push(chunk: Uint8Array): void {
    if (this.header === null) {
      const bodyFrom = this.collectHeader(chunk);
      if (bodyFrom < 0) {
        this.offset += chunk.length;
        return;
      }
      this.offset += bodyFrom;
      chunk = chunk.subarray(bodyFrom);
    }
    if (this.header!.encoding === 'binary') this.pushBinary(chunk);
    else this.lineReader!.push(chunk);
    this.offset += chunk.length;
  }

  /** Gathers header bytes; returns where the body starts in `chunk`, or −1 if the header goes on. */
  private collectHeader(chunk: Uint8Array): number {
    const before = this.headerLength;
    const take = Math.min(chunk.length, MAX_HEADER_BYTES - before);
    if (before + take > this.headerBytes.length) {
      const next = new Uint8Array(Math.min(MAX_HEADER_BYTES, Math.max(before + take, this.headerBytes.length * 2)));
      next.set(this.headerBytes.subarray(0, before));
      this.headerBytes = next;
    }
    this.headerBytes.set(chunk.subarray(0, take), before);
    this.headerLength = before + take;
    const h = this.headerBytes;
    if (this.headerLength >= 3 && !(h[0] === 0x70 && h[1] === 0x6c && h[2] === 0x79)) {
      throw new MeasureFileError('measure.header', `This is not a PLY file: it starts with "${tokenText(h, 0, Math.min(12, this.headerLength))}" instead of "ply".`, { line: 1, byteOffset: 0 });
    }
    const end = findEndHeader(h, Math.max(0, before - 12), this.headerLength);
    if (end < 0) {
      if (this.headerLength >= MAX_HEADER_BYTES) {
        throw new MeasureFileError('measure.header', `The PLY header has no "end_header" line in its first ${MAX_HEADER_BYTES} bytes.`, { byteOffset: MAX_HEADER_BYTES });
      }
      return -1;
    }
    let text = '';
    for (let i = 0; i < end; i++) text += String.fromCharCode(h[i]!);
    this.start(parsePlyHeader(text, end));
    return end - before;
  }

  private start(header: PlyHeader): void {
    this.header = header;
    const vi = header.elements.findIndex((e) => e.name === 'vertex');
    if (vi < 0) throw headerError('no "element vertex" — the file has no points.', header.lines);
    const vertex = header.elements[vi]!;
    const axis = (['x', 'y', 'z'] as const).map((a) => vertex.properties.findIndex((p) => p.name === a));
    const missing = (['x', 'y', 'z'] as const).filter((_, k) => axis[k]! < 0);
    if (missing.length) throw headerError(`the vertex element has no ${missing.join(', ')} property.`, vertex.headerLine);
    for (const k of axis) if (vertex.properties[k!]!.list) throw headerError('x, y and z must be single numbers, not lists.', vertex.headerLine);
    this.vertexTotal = vertex.count;
    this.remaining = vertex.count;
    if (vertex.count > this.buffer.maxPoints) {
      throw new MeasureFileError(
        'measure.tooManyPoints',
        `The PLY header announces ${vertex.count.toLocaleString('en-US')} vertices, more than the ${this.buffer.maxPoints.toLocaleString('en-US')} one upload may hold. Thin the scan and upload again.`,
        { line: vertex.headerLine },
      );
    }
    this.buffer = new PointBuffer({ ...this.opts, sizeHint: vertex.count });
    const before = header.elements.slice(0, vi);
    if (header.encoding === 'binary') {
      for (const e of before) {
        if (e.properties.some((p) => p.list)) {
          throw new MeasureFileError('measure.unsupported', `PLY header, line ${e.headerLine}: element "${e.name}" comes before the vertices and has list properties; put the vertex element first.`, { line: e.headerLine });
        }
        this.skipBytes += e.count * e.properties.reduce((s, p) => s + TYPE_SIZE[p.type!], 0);
      }
      if (vertex.properties.some((p) => p.list)) {
        throw new MeasureFileError('measure.unsupported', `PLY header, line ${vertex.headerLine}: the vertex element has a list property; only single-number vertex properties are read.`, { line: vertex.headerLine });
      }
      let off = 0;
      const offs: number[] = [];
      for (const p of vertex.properties) {
        offs.push(off);
        off += TYPE_SIZE[p.type!];
      }
      this.stride = off;
      this.offsets = [offs[axis[0]!]!, offs[axis[1]!]!, offs[axis[2]!]!];
      this.readers = [readerFor(vertex.properties[axis[0]!]!.type!), readerFor(vertex.properties[axis[1]!]!.type!), readerFor(vertex.properties[axis[2]!]!.type!)];
      this.pending = new Uint8Array(this.stride);
      this.vertexStart = header.length + this.skipBytes;
    } else {
      this.skipLines = before.reduce((s, e) => s + e.count, 0);
      this.columnsOf = [axis[0]!, axis[1]!, axis[2]!];
      this.propertyCount = vertex.properties.length;
      this.lineReader = new LineReader((b, s, e, line, off) => this.asciiLine(b, s, e, line, off), 'ASCII PLY', header.length, header.lines);
    }
  }

  private pushBinary(chunk: Uint8Array): void {
    let i = 0;
    const n = chunk.length;
    if (this.skipBytes > 0) {
      const k = Math.min(this.skipBytes, n);
      this.skipBytes -= k;
      i += k;
    }
    if (this.remaining === 0 || i >= n) return;
    const stride = this.stride;
    if (this.pendingLength > 0) {
      const k = Math.min(stride - this.pendingLength, n - i);
      this.pending.set(chunk.subarray(i, i + k), this.pendingLength);
      this.pendingLength += k;
      i += k;
      if (this.pendingLength < stride) return;
      this.decode(new DataView(this.pending.buffer, this.pending.byteOffset, stride), 0);
      this.pendingLength = 0;
    }
    const view = new DataView(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    const [ox, oy, oz] = this.offsets;
    const [rx, ry, rz] = this.readers!;
    const buffer = this.buffer;
    while (this.remaining > 0 && i + stride <= n) {
      const x = rx(view, i + ox);
      const y = ry(view, i + oy);
      const z = rz(view, i + oz);
      // x − x is 0 for finite x, NaN for NaN and ±Infinity
      if (x - x + (y - y) + (z - z) !== 0) this.nonFinite(x, y, z);
      buffer.add(x, y, z);
      this.remaining--;
      i += stride;
    }
    if (this.remaining > 0 && i < n) {
      this.pending.set(chunk.subarray(i, n), 0);
      this.pendingLength = n - i;
    }
  }

  private decode(view: DataView, at: number): void {
    const [ox, oy, oz] = this.offsets;
    const [rx, ry, rz] = this.readers!;
    const x = rx(view, at + ox);
    const y = ry(view, at + oy);
    const z = rz(view, at + oz);
    if (x - x + (y - y) + (z - z) !== 0) this.nonFinite(x, y, z);
    this.buffer.add(x, y, z);
    this.remaining--;
  }

  private nonFinite(x: number, y: number, z: number): never {
    const index = this.vertexTotal - this.remaining;
    const axis = !Number.isFinite(x) ? 0 : !Number.isFinite(y) ? 1 : 2;
    const value = [x, y, z][axis]!;
    const byteOffset = this.vertexStart + index * this.stride + this.offsets[axis]!;
    throw new MeasureFileError(
      'measure.nonFinite',
      `Vertex ${index} (byte ${byteOffset}) has ${'xyz'[axis]} = ${String(value)}; every coordinate must be a finite number.`,
      { byteOffset },
    );
  }

  private asciiLine(bytes: Uint8Array, start: number, end: number, line: number, byteOffset: number): void {
    if (this.skipLines > 0) {
      this.skipLines--;
      return;
    }
    if (this.remaining === 0) return;
    const count = splitFields(bytes, start, end, this.starts, this.ends);
    if (count === 0) {
      throw new MeasureFileError('measure.columns', `Line ${line} is empty where vertex ${this.vertexTotal - this.remaining} should be.`, { line, byteOffset });
    }
    if (count < this.propertyCount) {
      throw new MeasureFileError(
        'measure.columns',
        `Line ${line} has ${Math.max(count, 0)} values; the header's vertex element has ${this.propertyCount} properties.`,
        { line, byteOffset },
      );
    }
    const values = this.columnsOf.map((col) => {
      const s = this.starts[col]!;
      const e = this.ends[col]!;
      const v = parseDecimal(bytes, s, e);
      if (!Number.isFinite(v)) {
        const token = tokenText(bytes, s, e);
        const nonFinite = /^[+-]?(nan|inf)/i.test(token);
        throw new MeasureFileError(
          nonFinite ? 'measure.nonFinite' : 'measure.badNumber',
          `Line ${line}, column ${col + 1}: "${token}" is not ${nonFinite ? 'a finite number' : 'a number'}.`,
          { line, byteOffset: byteOffset + (s - start) },
        );
      }
      return v;
    });
    this.buffer.add(values[0]!, values[1]!, values[2]!);
    this.remaining--;
  }

  end(): ParsedCloud {
    if (this.header === null) {
      if (this.headerLength === 0) throw new MeasureFileError('measure.empty', 'The file is empty.', { byteOffset: 0 });
      throw new MeasureFileError('measure.truncated', `The file ends at byte ${this.offset} inside the PLY header (no "end_header" line).`, { byteOffset: this.offset });
    }
    if (this.lineReader) {
      this.lineReader.end();
      if (this.skipLines > 0 || this.remaining > 0) {
        throw new MeasureFileError(
          'measure.truncated',
          `The file ends at line ${this.lineReader.linesRead} after ${this.vertexTotal - this.remaining} of the ${this.vertexTotal} vertices its header announces — it was cut short.`,
          { line: this.lineReader.linesRead, byteOffset: this.offset },
        );
      }
    } else if (this.remaining > 0 || this.skipBytes > 0) {
      const done = this.vertexTotal - this.remaining;
      throw new MeasureFileError(
        'measure.truncated',
        `The file ends at byte ${this.offset}${this.pendingLength > 0 ? ` inside vertex ${done}` : ''}: its header announces ${this.vertexTotal} vertices of ${this.stride} bytes, so the vertices run to byte ${this.vertexStart + this.vertexTotal * this.stride}; only ${done} are complete — it was cut short.`,
        { byteOffset: this.offset },
      );
    }
    if (this.buffer.count === 0) throw new MeasureFileError('measure.empty', 'The PLY file has no vertices.', { line: this.header.lines });
    return {
      format: 'ply',
      encoding: this.header.encoding,
      count: this.buffer.count,
      points: this.buffer.points(),
      bbox: this.buffer.bbox()!,
      labels: [],
      labelIndex: null,
      triangleCount: null,
      columns: null,
      unitsFromHeader: unitsFromComments(this.header.comments),
      bytesRead: this.offset,
    };
  }
}

/** `end_header` followed by a line break; returns the offset just after the break, or −1. */
function findEndHeader(h: Uint8Array, from: number, to: number): number {
  const word = [0x65, 0x6e, 0x64, 0x5f, 0x68, 0x65, 0x61, 0x64, 0x65, 0x72]; // end_header
  outer: for (let i = from; i + word.length < to; i++) {
    for (let k = 0; k < word.length; k++) if (h[i + k] !== word[k]) continue outer;
    if (i > 0 && h[i - 1] !== 10 && h[i - 1] !== 13) continue;
    let j = i + word.length;
    while (j < to && (h[j] === 32 || h[j] === 9)) j++;
    if (j >= to) return -1;
    if (h[j] === 10) return j + 1;
    if (h[j] === 13) {
      if (j + 1 >= to) return -1;
      return h[j + 1] === 10 ? j + 2 : j + 1;
    }
  }
  return -1;
}

function unitsFromComments(comments: string[]): 'mm' | 'in' | null {
  for (const c of comments) {
    const m = /\bunits?\s*[:=]?\s*(mm|millimet(?:er|re)s?|in|inch(?:es)?)\b/i.exec(c);
    if (m) return m[1]!.toLowerCase().startsWith('m') ? 'mm' : 'in';
  }
  return null;
}
