/**
 * Probe / CMM-style CSV of measured features, read by its header (column order is free):
 *   feature id column: id | feature | feature_id | featureId
 *   values: x, y, z, diameter (or d, dia), depth — optionally with a "_mm" suffix; all in mm
 * Delimiter from the header line (comma, semicolon or tab); with semicolon or tab a decimal
 * comma is read as a decimal point. Blank lines and lines starting with # are skipped.
 * Every problem is reported with its line: missing columns, bad numbers, unknown ids.
 */
import type { InspectionPlan } from './plan';
import { rowProblems, type MeasurementRow, type RowError } from './measurements';

export interface CsvParseResult {
  readonly rows: readonly MeasurementRow[];
  readonly errors: readonly RowError[];
}

type Column = 'featureId' | 'x' | 'y' | 'z' | 'diameter' | 'depth';

const ALIASES: Record<string, Column> = {
  id: 'featureId',
  feature: 'featureId',
  featureid: 'featureId',
  feature_id: 'featureId',
  'feature id': 'featureId',
  x: 'x',
  y: 'y',
  z: 'z',
  diameter: 'diameter',
  dia: 'diameter',
  d: 'diameter',
  depth: 'depth',
};

function columnOf(header: string): Column | undefined {
  const h = header.trim().replace(/^"|"$/g, '').toLowerCase().replace(/\s*\(mm\)$/, '').replace(/_mm$/, '');
  return ALIASES[h];
}

function splitLine(line: string, delimiter: string): string[] {
  // quoted cells ("…", "" inside) as in RFC 4180
  const out: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i]!;
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === delimiter) {
      out.push(cell);
      cell = '';
    } else cell += c;
  }
  out.push(cell);
  return out.map((s) => s.trim());
}

const NUMBER_RE = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

export function parseInspectionCsv(text: string, plan: InspectionPlan): CsvParseResult {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  const errors: RowError[] = [];
  const headerIndex = lines.findIndex((l) => l.trim() !== '' && !l.trimStart().startsWith('#'));
  if (headerIndex < 0) return { rows: [], errors: [{ row: 1, message: 'the file is empty: expected a header line such as "id,x,y,diameter,depth"' }] };
  const headerLine = lines[headerIndex]!;
  const counts = [',', ';', '\t'].map((d) => [d, headerLine.split(d).length - 1] as const);
  const delimiter = counts.reduce((a, b) => (b[1] > a[1] ? b : a))[0];
  const decimalComma = delimiter !== ',';
  const headers = splitLine(headerLine, delimiter);
  const columns: (Column | undefined)[] = headers.map(columnOf);
  const headerRow = headerIndex + 1;
  const unknownHeaders = headers.filter((h, i) => h !== '' && columns[i] === undefined);
  if (unknownHeaders.length) errors.push({ row: headerRow, message: `unknown column${unknownHeaders.length > 1 ? 's' : ''} ${unknownHeaders.map((h) => `"${h}"`).join(', ')}: use id, x, y, z, diameter, depth` });
  const dupes = columns.filter((c, i) => c !== undefined && columns.indexOf(c) !== i);
  if (dupes.length) errors.push({ row: headerRow, message: `column ${dupes[0]} appears twice in the header` });
  if (!columns.includes('featureId')) errors.push({ row: headerRow, column: 'featureId', message: 'missing column: the feature id (header "id")' });
  if (!columns.some((c) => c && c !== 'featureId')) errors.push({ row: headerRow, message: 'missing columns: at least one of x, y, z, diameter, depth' });
  if (columns.includes('x') !== columns.includes('y')) errors.push({ row: headerRow, column: columns.includes('x') ? 'y' : 'x', message: `missing column ${columns.includes('x') ? 'y' : 'x'}: a centre needs both x and y` });
  if (errors.length) return { rows: [], errors };

  const rows: MeasurementRow[] = [];
  const lineOf: number[] = [];
  for (let li = headerIndex + 1; li < lines.length; li++) {
    const line = lines[li]!;
    if (line.trim() === '' || line.trimStart().startsWith('#')) continue;
    const lineNo = li + 1;
    const cells = splitLine(line, delimiter);
    if (cells.length > headers.length) {
      errors.push({ row: lineNo, message: `${cells.length} cells, the header has ${headers.length} columns` });
      continue;
    }
    const row: Record<string, unknown> = {};
    let bad = false;
    columns.forEach((c, i) => {
      if (!c) return;
      const raw = cells[i] ?? '';
      if (c === 'featureId') {
        row.featureId = raw;
        return;
      }
      if (raw === '') return;
      const norm = decimalComma ? raw.replace(',', '.') : raw;
      if (!NUMBER_RE.test(norm)) {
        errors.push({ row: lineNo, featureId: String(row.featureId ?? cells[columns.indexOf('featureId')] ?? ''), column: c, message: `"${raw}" in column ${c} is not a number (mm, with a decimal point${decimalComma ? ' or comma' : ''})` });
        bad = true;
        return;
      }
      const v = Number(norm);
      if (c === 'diameter' && v <= 0) {
        errors.push({ row: lineNo, column: c, message: `diameter ${raw} must be greater than 0 mm` });
        bad = true;
      } else if (c === 'depth' && v < 0) {
        errors.push({ row: lineNo, column: c, message: `depth ${raw} must be 0 mm or more` });
        bad = true;
      } else row[c] = v;
    });
    if (!row.featureId) {
      errors.push({ row: lineNo, column: 'featureId', message: 'no feature id in this row' });
      continue;
    }
    if (bad) continue;
    rows.push(row as MeasurementRow);
    lineOf.push(lineNo);
  }
  errors.push(...rowProblems(plan, rows, (i) => lineOf[i]!));
  errors.sort((a, b) => a.row - b.row);
  return { rows: errors.length ? [] : rows, errors };
}

/** Measurement rows back to CSV (the same header the parser reads). */
export function inspectionCsv(rows: readonly MeasurementRow[]): string {
  const cell = (v: number | undefined) => (v === undefined ? '' : String(v));
  return ['id,x,y,z,diameter,depth', ...rows.map((r) => [r.featureId, cell(r.x), cell(r.y), cell(r.z), cell(r.diameter), cell(r.depth)].join(','))].join('\n') + '\n';
}
