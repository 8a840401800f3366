/**
 * Reads a block of hole rows pasted from a spreadsheet or a text file: tab-, semicolon-, comma-
 * or space-separated X, Y and an optional size, with an optional id column first and an
 * optional header row. Lengths accept whatever `parseLength` accepts; a cell without a unit is
 * in the column's unit (from the header, e.g. `X (in)`) or else the editor's display unit.
 *
 * Size: a fastener (`M10x1.5`, `M8`, `3/8-16 UNC`, `#10-24`, or a bare inch size `3/8`) makes a
 * clearance hole for it; a decimal length (`11`, `0.406"`, `11 mm`) is an explicit diameter.
 * Every line that cannot be read is reported with its line number and nothing of it is used.
 */
import { isDomainError } from '../errors';
import { parseFastener } from '../standards/threads';
import { parseLength, type LengthUnit } from '../units';

export interface PastedHoleRow {
  /** 1-based line number in the pasted text */
  readonly line: number;
  readonly id?: string;
  readonly xMm: number;
  readonly yMm: number;
  readonly fastener?: string;
  readonly diameterMm?: number;
}

export interface PasteProblem {
  readonly line: number;
  readonly message: string;
}

export interface PasteResult {
  readonly rows: readonly PastedHoleRow[];
  readonly problems: readonly PasteProblem[];
  readonly headerFound: boolean;
  readonly separator: 'tab' | 'semicolon' | 'comma' | 'space';
}

type Column = 'id' | 'x' | 'y' | 'size';

const SEPARATORS = { tab: /\t/, semicolon: /;/, comma: /,/, space: /\s+/ } as const;

function pickSeparator(lines: readonly string[]): PasteResult['separator'] {
  if (lines.some((l) => l.includes('\t'))) return 'tab';
  if (lines.some((l) => l.includes(';'))) return 'semicolon';
  if (lines.some((l) => l.includes(','))) return 'comma';
  return 'space';
}

function isLength(text: string, unit: LengthUnit): boolean {
  try {
    parseLength(text, unit);
    return true;
  } catch (e) {
    if (isDomainError(e)) return false;
    throw e;
  }
}

const FASTENER_LIKE = /^(m\d|#\d)|-\s*\d+|\bun[cf]\b|^\d+\/\d+$/i;

/** A size cell: fastener designation or an explicit diameter. */
export function readSizeCell(text: string, unit: LengthUnit): { fastener?: string; diameterMm?: number } | { error: string } {
  const t = text.trim();
  if (t === '') return {};
  if (FASTENER_LIKE.test(t)) {
    try {
      return { fastener: parseFastener(t).designation };
    } catch (e) {
      if (!isDomainError(e)) throw e;
      return { error: `size "${t}" is not a fastener this editor knows (e.g. M10x1.5, M8, 3/8-16 UNC, 3/8)` };
    }
  }
  try {
    const d = parseLength(t, unit);
    if (!(d > 0)) return { error: `size "${t}" must be greater than 0` };
    return { diameterMm: d };
  } catch (e) {
    if (!isDomainError(e)) throw e;
    return { error: `size "${t}" is neither a fastener (M10x1.5, 3/8-16 UNC) nor a diameter (11, 0.406")` };
  }
}

function headerColumns(cells: readonly string[]): { columns: Column[]; units: (LengthUnit | undefined)[] } | null {
  const columns: Column[] = [];
  const units: (LengthUnit | undefined)[] = [];
  for (const raw of cells) {
    const c = raw.trim().toLowerCase();
    const unit: LengthUnit | undefined = /\bmm\b|millim/.test(c) ? 'mm' : /\bin\b|inch|"/.test(c) ? 'in' : undefined;
    const name = c.replace(/[([].*$/, '').trim();
    let col: Column | null = null;
    if (/^(id|name|hole|feature|#|no\.?)$/.test(name)) col = 'id';
    else if (/^x\b|^x_/.test(name)) col = 'x';
    else if (/^y\b|^y_/.test(name)) col = 'y';
    else if (/^(size|fastener|bolt|thread|dia|diameter|d|ø|⌀)/.test(name)) col = 'size';
    if (col === null) return null;
    columns.push(col);
    units.push(unit);
  }
  return columns.includes('x') && columns.includes('y') ? { columns, units } : null;
}

const ID_RE = /^[A-Za-z][A-Za-z0-9_-]{0,15}$/;

export function parseHoleRows(text: string, defaultUnit: LengthUnit): PasteResult {
  const all = text.replace(/\r\n?/g, '\n').split('\n');
  const numbered = all.map((l, i) => ({ line: i + 1, text: l })).filter((l) => l.text.trim() !== '');
  const separator = pickSeparator(numbered.map((l) => l.text));
  const split = (l: string) => {
    const cells = l.split(SEPARATORS[separator]).map((c) => c.trim());
    // a trailing separator (common when copying whole rows) is not a column
    while (cells.length > 1 && cells[cells.length - 1] === '') cells.pop();
    return separator === 'space' ? cells.filter((c) => c !== '') : cells;
  };
  const rows: PastedHoleRow[] = [];
  const problems: PasteProblem[] = [];
  let columns: Column[] | null = null;
  let units: (LengthUnit | undefined)[] = [];
  let headerFound = false;
  numbered.forEach((l, k) => {
    const cells = split(l.text);
    if (k === 0) {
      const h = headerColumns(cells);
      if (h) {
        columns = h.columns;
        units = h.units;
        headerFound = true;
        return;
      }
    }
    let cols: Column[];
    if (columns) cols = columns;
    else if (cells.length >= 3 && !isLength(cells[0]!, defaultUnit) && isLength(cells[1]!, defaultUnit)) cols = ['id', 'x', 'y', 'size'];
    else cols = ['x', 'y', 'size'];
    const get = (c: Column): { text: string; unit: LengthUnit } | undefined => {
      const i = cols.indexOf(c);
      if (i < 0 || i >= cells.length) return undefined;
      return { text: cells[i]!, unit: units[i] ?? defaultUnit };
    };
    const x = get('x');
    const y = get('y');
    if (!x || !y || x.text === '' || y.text === '') {
      problems.push({ line: l.line, message: `line ${l.line}: needs X and Y (got "${l.text.trim()}")` });
      return;
    }
    if (cells.length > cols.length) {
      problems.push({ line: l.line, message: `line ${l.line}: ${cells.length} columns, expected at most ${cols.length} (${cols.join(', ')})` });
      return;
    }
    const read = (v: { text: string; unit: LengthUnit }, axis: string): number | string => {
      try {
        return parseLength(v.text, v.unit);
      } catch (e) {
        if (!isDomainError(e)) throw e;
        const hint = v.text.includes(',') ? ' (use a dot for decimals)' : '';
        return `line ${l.line}: ${axis} "${v.text}" is not a length${hint}`;
      }
    };
    const xv = read(x, 'X');
    const yv = read(y, 'Y');
    if (typeof xv === 'string' || typeof yv === 'string') {
      problems.push({ line: l.line, message: [xv, yv].filter((v) => typeof v === 'string').join('; ') });
      return;
    }
    const idCell = get('id');
    if (idCell && idCell.text !== '' && !ID_RE.test(idCell.text)) {
      problems.push({ line: l.line, message: `line ${l.line}: id "${idCell.text}" must start with a letter (e.g. E9, T12)` });
      return;
    }
    const sizeCell = get('size');
    const size = sizeCell ? readSizeCell(sizeCell.text, sizeCell.unit) : {};
    if ('error' in size) {
      problems.push({ line: l.line, message: `line ${l.line}: ${size.error}` });
      return;
    }
    rows.push({
      line: l.line,
      ...(idCell && idCell.text !== '' ? { id: idCell.text } : {}),
      xMm: xv,
      yMm: yv,
      ...size,
    });
  });
  return { rows, problems, headerFound, separator };
}
