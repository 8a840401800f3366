/**
 * Which parser reads a file, and does the content match the file's name? The first bytes are
 * checked against the extension before anything is parsed, so a mesh named `.xyz` or a text
 * list named `.ply` is refused with a message saying what the file really is.
 */
import { MeasureFileError } from './errors';
import { PlyParser } from './ply';
import type { PointBufferOptions } from './pointBuffer';
import { looksLikeAsciiStl, StlParser } from './stl';
import { TextPointParser } from './textPoints';
import { MEASURE_FORMATS, type MeasureFormat, type ParsedCloud, type StreamParser } from './types';

const EXTENSIONS: Readonly<Record<string, MeasureFormat>> = Object.freeze({
  xyz: 'xyz',
  txt: 'xyz',
  asc: 'xyz',
  pts: 'xyz',
  csv: 'csv',
  ply: 'ply',
  stl: 'stl',
});

export const ACCEPTED_EXTENSIONS: readonly string[] = Object.freeze(Object.keys(EXTENSIONS).map((e) => `.${e}`));

/** Format named by a file's extension, or null. */
export function formatFromFileName(fileName: string): MeasureFormat | null {
  const m = /\.([A-Za-z0-9]+)$/.exec(fileName.trim());
  return m ? (EXTENSIONS[m[1]!.toLowerCase()] ?? null) : null;
}

export type ContentKind = 'ply' | 'stl-ascii' | 'binary' | 'text';

/** What the first bytes look like. */
export function sniffContent(head: Uint8Array, complete: boolean): { kind: ContentKind; binaryAt: number } {
  if (head.length >= 3 && head[0] === 0x70 && head[1] === 0x6c && head[2] === 0x79 && (head[3] === 10 || head[3] === 13 || head.length === 3)) return { kind: 'ply', binaryAt: -1 };
  if (looksLikeAsciiStl(head, complete)) return { kind: 'stl-ascii', binaryAt: -1 };
  for (let i = 0; i < head.length; i++) {
    const c = head[i]!;
    if (c === 0 || (c < 32 && c !== 9 && c !== 10 && c !== 13)) return { kind: 'binary', binaryAt: i };
  }
  return { kind: 'text', binaryAt: -1 };
}

const KIND_WORDS: Record<ContentKind, string> = {
  ply: 'a PLY file (it starts with "ply")',
  'stl-ascii': 'an ASCII STL mesh (it starts with "solid" and lists facets)',
  binary: 'binary data',
  text: 'a text point list',
};

function checkMatch(format: MeasureFormat, fileName: string, head: Uint8Array, complete: boolean): void {
  const { kind, binaryAt } = sniffContent(head, complete);
  const named = `"${fileName}" is named .${fileName.split('.').pop()!.toLowerCase()}`;
  const mismatch = (hint: string): never => {
    throw new MeasureFileError('measure.formatMismatch', `${named} but its content is ${KIND_WORDS[kind]}${kind === 'binary' ? ` (byte ${binaryAt} is 0x${head[binaryAt]!.toString(16).padStart(2, '0')})` : ''}. ${hint}`, { byteOffset: kind === 'binary' ? binaryAt : 0 });
  };
  if (format === 'ply') {
    if (kind !== 'ply') mismatch(kind === 'text' ? 'Rename it to .xyz or .csv.' : kind === 'stl-ascii' ? 'Rename it to .stl.' : 'A PLY file starts with the line "ply"; a binary file without it may be an STL — rename it to .stl.');
  } else if (format === 'stl') {
    if (kind === 'ply') mismatch('Rename it to .ply.');
    if (kind === 'text') mismatch('Rename it to .xyz or .csv.');
  } else {
    if (kind === 'ply') mismatch('Rename it to .ply.');
    if (kind === 'stl-ascii') mismatch('Rename it to .stl.');
    if (kind === 'binary') mismatch('An XYZ or CSV file is text; a binary scan may be a binary PLY or STL — rename it accordingly.');
  }
}

export interface MeasureParseOptions extends PointBufferOptions {
  /** the file's name, for the format and the checks */
  readonly fileName: string;
}

const SNIFF = 512;

/**
 * A streaming parser for one file: picks the format from the name, checks the first bytes match,
 * then hands every chunk to the format's parser. Feed it `push(chunk)`, then `end()`.
 */
export class MeasureFileParser implements StreamParser {
  readonly format: MeasureFormat;
  private inner: StreamParser;
  private head = new Uint8Array(SNIFF);
  private headLength = 0;
  private checked = false;
  private held: Uint8Array[] = [];

  constructor(private readonly opts: MeasureParseOptions) {
    const format = formatFromFileName(opts.fileName);
    if (!format) {
      throw new MeasureFileError(
        'measure.unsupported',
        `"${opts.fileName}" has no known extension; measurement files are ${ACCEPTED_EXTENSIONS.join(', ')} (XYZ/CSV point lists, PLY, STL).`,
      );
    }
    this.format = format;
    this.inner = format === 'ply' ? new PlyParser(opts) : format === 'stl' ? new StlParser(opts) : new TextPointParser(format, opts);
  }

  get bytesRead(): number {
    return this.checked ? this.inner.bytesRead : this.headLength;
  }

  push(chunk: Uint8Array): void {
    if (chunk.length === 0) return;
    if (!this.checked) {
      const take = Math.min(chunk.length, SNIFF - this.headLength);
      this.head.set(chunk.subarray(0, take), this.headLength);
      this.headLength += take;
      this.held.push(chunk);
      if (this.headLength < SNIFF) return;
      this.release(false);
      return;
    }
    this.inner.push(chunk);
  }

  private release(complete: boolean): void {
    checkMatch(this.format, this.opts.fileName, this.head.subarray(0, this.headLength), complete);
    this.checked = true;
    const held = this.held;
    this.held = [];
    for (const c of held) this.inner.push(c);
  }

  end(): ParsedCloud {
    if (!this.checked) {
      if (this.headLength === 0) throw new MeasureFileError('measure.empty', `"${this.opts.fileName}" is empty (0 bytes).`, { byteOffset: 0 });
      this.release(true);
    }
    return this.inner.end();
  }
}

/** Parses a whole file held in memory, in chunks of `chunkBytes` (tests, small files, the worker). */
export function parseMeasureFile(bytes: Uint8Array, opts: MeasureParseOptions & { chunkBytes?: number }): ParsedCloud {
  const parser = new MeasureFileParser(opts);
  const step = opts.chunkBytes ?? 1 << 20;
  for (let i = 0; i < bytes.length; i += step) parser.push(bytes.subarray(i, Math.min(bytes.length, i + step)));
  return parser.end();
}

export { MEASURE_FORMATS };
