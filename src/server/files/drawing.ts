/**
 * The machinist's drawing (PDF, pdf-lib): plate view with the datum and key dimensions, hole
 * table with fits and limits, material, thickness, general tolerances, check summary, title block
 * with the hashes of the approved spec and files, and the safety cautions. A3 or US Tabloid,
 * landscape. The hole table continues on further sheets when it is long.
 *
 * Font: Source Sans 3 (shipped with the app), embedded from its WOFF files through fontkit.
 */
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import fontkit from '@pdf-lib/fontkit';
import { PDFDocument, type PDFFont, type PDFPage, rgb, degrees, LineCapStyle } from 'pdf-lib';
import type { Finding } from '../../domain/checks';
import type { PlateProfile } from '../../domain/profileTypes';
import { holeTable, type HoleTableRow } from '../../domain/exports/holeTable';
import { chainPathData } from '../../domain/exports/svg';
import { chainBounds } from '../../domain/exports/outlineMath';
import { engravingText, placeEngraving } from '../../domain/exports/engraving';

export type Paper = 'A3' | 'tabloid';

export interface DrawingMeta {
  readonly partNumber: string;
  readonly revision: string | number;
  readonly status: string;
  readonly title: string;
  readonly material: string;
  readonly author: string;
  readonly approver?: string | null;
  /** ISO 8601 date or date-time */
  readonly approvedAt?: string | null;
  readonly specSha256: string;
  readonly fileHashes: readonly { readonly name: string; readonly sha256: string }[];
}

export interface DrawingInput {
  readonly profile: PlateProfile;
  readonly findings: readonly Pick<Finding, 'severity' | 'code' | 'message' | 'featureIds'>[];
  readonly meta: DrawingMeta;
  readonly paper?: Paper;
}

const MM = 72 / 25.4;
/** page sizes in points, landscape: A3 420 × 297 mm (ISO 216), Tabloid 17 × 11 in (ANSI B) */
export const PAPER_SIZES: Record<Paper, [number, number]> = {
  A3: [420 * MM, 297 * MM],
  tabloid: [17 * 72, 11 * 72],
};

export const SAFETY_CAUTIONS: readonly string[] = [
  'Fasteners: use bolts of the proper grade and length, tightened to the maker\'s torque; use thread locker (with primer on aluminium) and steel thread inserts where specified.',
  'Containment: fit a scatter shield or an approved containment bell housing wherever racing or local rules require one.',
  'Alignment: before running, check runout / concentricity of the transmission input axis to the crank axis with a dial indicator (TIR) and check the pilot bearing fit.',
  'Dowels locate, bolts clamp: never run without the dowels fitted.',
  'This drawing is a draft from Platewright. Local codes, racing-body rules and licensed engineering practice decide whether the part is fit for use.',
];

export const GENERAL_TOLERANCES: readonly string[] = [
  'Dimensions in millimetres. Plate coordinates: origin on the crank axis (datum A), seen from the transmission side, +X right, +Y up.',
  'Untoleranced linear dimensions: ISO 2768-m. Hole positions: true position Ø0.10 to datum A unless noted.',
  'Both faces machined: flatness 0.05, parallelism 0.05. Fits and limits as listed in the hole table.',
  'Threads: metric ISO 6H, unified 2B. Break sharp edges 0.2 unless a chamfer is given.',
];

const INK = rgb(0.1, 0.12, 0.14);
const GREY = rgb(0.45, 0.47, 0.5);
const LIGHT = rgb(0.85, 0.86, 0.88);
const ACCENT = rgb(0.12, 0.31, 0.55);
const RED = rgb(0.7, 0.12, 0.1);

function fontPath(weight: 400 | 600): string {
  return createRequire(import.meta.url).resolve(`@fontsource/source-sans-3/files/source-sans-3-latin-${weight}-normal.woff`);
}

let fontBytes: Promise<[Uint8Array, Uint8Array]> | null = null;
function loadFonts(): Promise<[Uint8Array, Uint8Array]> {
  fontBytes ??= Promise.all([readFile(fontPath(400)), readFile(fontPath(600))]).then(([a, b]) => [new Uint8Array(a), new Uint8Array(b)]);
  return fontBytes;
}

const mm3 = (v: number) => (Math.round(v * 1000) / 1000).toFixed(3).replace(/^-0\.000$/, '0.000');
const mm2 = (v: number) => (Math.round(v * 100) / 100).toFixed(2);

const OP_LABEL: Record<HoleTableRow['operation'], string> = {
  through: 'drill thru',
  tapDrill: 'tap drill',
  dowelReam: 'ream (dowel)',
  centreBore: 'centre bore',
  starterBore: 'starter bore',
  counterbore: 'counterbore',
};

interface Ctx {
  doc: PDFDocument;
  regular: PDFFont;
  bold: PDFFont;
  chars: Set<number>;
}

/** Keep to the glyphs the embedded font has (findings may use symbols it lacks). */
function clean(ctx: Ctx, s: string): string {
  const map: Record<string, string> = { '≥': '>=', '≤': '<=', '·': '.', '−': '-', '√': 'sqrt', '≈': '~', '→': '->', '‘': "'", '’': "'", '“': '"', '”': '"' };
  let out = '';
  for (const ch of s) {
    const cp = ch.codePointAt(0)!;
    if (ctx.chars.has(cp)) out += ch;
    else out += map[ch] ?? (cp < 128 ? ch : '?');
  }
  return out;
}

function text(ctx: Ctx, page: PDFPage, s: string, x: number, y: number, size: number, opts: { bold?: boolean; color?: ReturnType<typeof rgb>; align?: 'left' | 'right' | 'center'; rotate?: number } = {}) {
  const font = opts.bold ? ctx.bold : ctx.regular;
  const str = clean(ctx, s);
  const w = font.widthOfTextAtSize(str, size);
  const dx = opts.align === 'right' ? -w : opts.align === 'center' ? -w / 2 : 0;
  page.drawText(str, { x: x + dx, y, size, font, color: opts.color ?? INK, ...(opts.rotate ? { rotate: degrees(opts.rotate) } : {}) });
}

/** Wraps text into lines no wider than `width`. */
function wrap(ctx: Ctx, s: string, size: number, width: number, bold = false): string[] {
  const font = bold ? ctx.bold : ctx.regular;
  const words = clean(ctx, s).split(/\s+/);
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    const trial = line ? `${line} ${w}` : w;
    if (font.widthOfTextAtSize(trial, size) <= width || !line) line = trial;
    else {
      lines.push(line);
      line = w;
    }
  }
  if (line) lines.push(line);
  return lines;
}

function rect(page: PDFPage, x: number, y: number, w: number, h: number, opts: { fill?: ReturnType<typeof rgb>; border?: number } = {}) {
  page.drawRectangle({
    x,
    y,
    width: w,
    height: h,
    borderColor: opts.border === 0 ? undefined : INK,
    borderWidth: opts.border ?? 0.6,
    ...(opts.fill ? { color: opts.fill } : {}),
  });
}

function line(page: PDFPage, x1: number, y1: number, x2: number, y2: number, width = 0.5, color = INK, dash?: number[]) {
  page.drawLine({ start: { x: x1, y: y1 }, end: { x: x2, y: y2 }, thickness: width, color, ...(dash ? { dashArray: dash } : {}), lineCap: LineCapStyle.Butt });
}

function arrowHead(page: PDFPage, x: number, y: number, dx: number, dy: number, size = 5) {
  const l = Math.hypot(dx, dy);
  const ux = dx / l;
  const uy = dy / l;
  const px = -uy;
  const py = ux;
  page.drawSvgPath(`M0 0 L${-ux * size + px * size * 0.35} ${-(-uy * size + py * size * 0.35)} L${-ux * size - px * size * 0.35} ${-(-uy * size - py * size * 0.35)} Z`, {
    x,
    y,
    color: INK,
    borderWidth: 0,
  });
}

/** A dimension between two points along x or y, with extension lines, arrows and the value. */
function dimension(ctx: Ctx, page: PDFPage, a: { x: number; y: number }, b: { x: number; y: number }, offset: number, axis: 'x' | 'y', label: string) {
  if (axis === 'x') {
    const y = a.y + offset;
    line(page, a.x, a.y, a.x, y - Math.sign(offset) * 3, 0.3, GREY);
    line(page, b.x, b.y, b.x, y - Math.sign(offset) * 3, 0.3, GREY);
    line(page, a.x, y, b.x, y, 0.4);
    arrowHead(page, a.x, y, -1, 0);
    arrowHead(page, b.x, y, 1, 0);
    text(ctx, page, label, (a.x + b.x) / 2, y + 3, 8, { align: 'center' });
  } else {
    const x = a.x + offset;
    line(page, a.x, a.y, x - Math.sign(offset) * 3, a.y, 0.3, GREY);
    line(page, b.x, b.y, x - Math.sign(offset) * 3, b.y, 0.3, GREY);
    line(page, x, a.y, x, b.y, 0.4);
    arrowHead(page, x, a.y, 0, -1);
    arrowHead(page, x, b.y, 0, 1);
    text(ctx, page, label, x - 3, (a.y + b.y) / 2, 8, { align: 'center', rotate: 90 });
  }
}

export interface BoltCircle {
  readonly diameterMm: number;
  readonly ids: readonly string[];
}

/** Groups of ≥ 3 holes of one pattern on one circle about the datum (for the drawing's key dimensions). */
export function boltCircles(profile: PlateProfile): BoltCircle[] {
  const groups = new Map<string, { r: number; ids: string[] }>();
  for (const h of profile.holes) {
    if (h.face === 'plate') continue;
    const r = Math.hypot(h.center.x, h.center.y);
    if (r < 1) continue;
    const key = `${h.face}:${h.operation}:${Math.round(r * 1000)}`;
    const g = groups.get(key) ?? { r, ids: [] };
    g.ids.push(h.id);
    groups.set(key, g);
  }
  return [...groups.values()].filter((g) => g.ids.length >= 3).map((g) => ({ diameterMm: 2 * g.r, ids: g.ids })).sort((a, b) => b.diameterMm - a.diameterMm);
}

const STANDARD_SCALES = [5, 2, 1, 1 / 2, 1 / 2.5, 1 / 5, 1 / 10, 1 / 20];

function scaleLabel(s: number): string {
  return s >= 1 ? `${s}:1` : `1:${Math.round((1 / s) * 10) / 10}`;
}

function toleranceText(r: HoleTableRow): string {
  if (r.fit) return `${r.fit.designation} ${mm3(r.fit.lowerMm)} / ${mm3(r.fit.upperMm)}`;
  if (r.operation === 'tapDrill') return r.thread && /UN/i.test(r.thread) ? '2B' : '6H';
  return 'ISO 2768-m';
}

function depthText(r: HoleTableRow): string {
  return r.depthMm === null ? 'THRU' : mm2(r.depthMm);
}

function threadText(r: HoleTableRow): string {
  if (!r.thread) return '';
  return r.threadDepthMm ? `${r.thread} x ${mm2(r.threadDepthMm)}` : r.thread;
}

const TABLE_COLUMNS: { title: string; w: number; align: 'left' | 'right'; get: (r: HoleTableRow, t: number) => string }[] = [
  { title: 'ID', w: 26, align: 'left', get: (r) => r.id },
  { title: 'X', w: 44, align: 'right', get: (r) => mm3(r.xMm) },
  { title: 'Y', w: 44, align: 'right', get: (r) => mm3(r.yMm) },
  { title: 'Ø', w: 38, align: 'right', get: (r) => mm3(r.diameterMm) },
  { title: 'OPERATION', w: 62, align: 'left', get: (r) => OP_LABEL[r.operation] },
  { title: 'SIDE', w: 36, align: 'left', get: (r) => (r.side === 'engine' ? 'engine' : 'trans.') },
  { title: 'THREAD', w: 70, align: 'left', get: (r) => threadText(r) },
  { title: 'DEPTH', w: 34, align: 'right', get: (r) => depthText(r) },
  { title: 'TOL. / FIT LIMITS', w: 84, align: 'left', get: (r) => toleranceText(r) },
];
const TABLE_WIDTH = TABLE_COLUMNS.reduce((a, c) => a + c.w, 0);
const ROW_H = 10;

function drawTable(ctx: Ctx, page: PDFPage, rows: readonly HoleTableRow[], x: number, yTop: number, thicknessMm: number, title: string): number {
  let y = yTop;
  text(ctx, page, title, x, y - 10, 9, { bold: true });
  y -= 16;
  rect(page, x, y - ROW_H, TABLE_WIDTH, ROW_H, { fill: LIGHT, border: 0.5 });
  let cx = x;
  for (const c of TABLE_COLUMNS) {
    text(ctx, page, c.title, c.align === 'right' ? cx + c.w - 3 : cx + 3, y - ROW_H + 3.2, 7, { bold: true, align: c.align });
    cx += c.w;
  }
  y -= ROW_H;
  rows.forEach((r, i) => {
    if (i % 2 === 1) rect(page, x, y - ROW_H, TABLE_WIDTH, ROW_H, { fill: rgb(0.96, 0.965, 0.97), border: 0 });
    let cx2 = x;
    for (const c of TABLE_COLUMNS) {
      text(ctx, page, c.get(r, thicknessMm), c.align === 'right' ? cx2 + c.w - 3 : cx2 + 3, y - ROW_H + 3.2, 7.5, { align: c.align });
      cx2 += c.w;
    }
    y -= ROW_H;
  });
  rect(page, x, y, TABLE_WIDTH, yTop - 16 - y, { border: 0.6 });
  let vx = x;
  for (const c of TABLE_COLUMNS.slice(0, -1)) {
    vx += c.w;
    line(page, vx, y, vx, yTop - 16, 0.3, GREY);
  }
  return y;
}

function drawPlateView(ctx: Ctx, page: PDFPage, profile: PlateProfile, meta: DrawingMeta, box: { x: number; y: number; w: number; h: number }): number {
  const bb = chainBounds(profile.outline);
  const wMm = bb.maxX - bb.minX;
  const hMm = bb.maxY - bb.minY;
  const fit = Math.min((box.w - 90) / (wMm * MM), (box.h - 80) / (hMm * MM));
  const scale = STANDARD_SCALES.find((s) => s <= fit) ?? fit;
  const s = scale * MM; // points per plate millimetre
  const cx = box.x + box.w / 2 - ((bb.minX + bb.maxX) / 2) * s;
  const cy = box.y + box.h / 2 + 10 - ((bb.minY + bb.maxY) / 2) * s;
  const P = (x: number, y: number) => ({ x: cx + x * s, y: cy + y * s });

  // outline and pockets (true arcs through the SVG path, y already flipped in the path data)
  page.drawSvgPath(chainPathData(profile.outline), { x: cx, y: cy, scale: s, borderColor: INK, borderWidth: 1.1 });
  for (const p of profile.pockets) {
    page.drawSvgPath(chainPathData(p.outline), { x: cx, y: cy, scale: s, borderColor: ACCENT, borderWidth: 0.7, borderDashArray: [3, 2] });
    const pb = chainBounds(p.outline);
    const c = P((pb.minX + pb.maxX) / 2, (pb.minY + pb.maxY) / 2);
    text(ctx, page, p.id, c.x, c.y - 3, 7, { align: 'center', color: ACCENT, bold: true });
  }
  // bolt circles as centre lines
  for (const bc of boltCircles(profile)) {
    page.drawCircle({ x: cx, y: cy, size: (bc.diameterMm / 2) * s, borderColor: GREY, borderWidth: 0.3, borderDashArray: [6, 2, 1, 2] });
  }
  // holes
  for (const h of profile.holes) {
    const c = P(h.center.x, h.center.y);
    page.drawCircle({ x: c.x, y: c.y, size: (h.diameterMm / 2) * s, borderColor: INK, borderWidth: 0.7 });
    if (h.counterbore) {
      page.drawCircle({
        x: c.x,
        y: c.y,
        size: (h.counterbore.diameterMm / 2) * s,
        borderColor: INK,
        borderWidth: 0.5,
        ...(h.counterbore.fromSide === 'engine' ? { borderDashArray: [2, 1.5] } : {}),
      });
    }
    const lr = (Math.max(h.diameterMm, h.counterbore?.diameterMm ?? 0) / 2) * s;
    const m = 0.7071;
    text(ctx, page, h.id, c.x + lr * m + 1, c.y + lr * m + 1, 6, { color: h.operation === 'dowelReam' ? RED : GREY });
    // centre mark
    line(page, c.x - 2, c.y, c.x + 2, c.y, 0.25, GREY);
    line(page, c.x, c.y - 2, c.x, c.y + 2, 0.25, GREY);
  }
  // engraving position
  const eng = placeEngraving(profile, engravingText(meta));
  if (eng) {
    const c = P(eng.x, eng.y);
    text(ctx, page, eng.text, c.x, c.y - (eng.heightMm * s) / 3, Math.max(4, eng.heightMm * s), { align: 'center', color: rgb(0.55, 0.3, 0.6) });
  }
  // datum A: the crank axis
  const o = P(0, 0);
  const arm = Math.min(22, 0.08 * wMm * s);
  line(page, o.x - arm, o.y, o.x + arm, o.y, 0.8, ACCENT);
  line(page, o.x, o.y - arm, o.x, o.y + arm, 0.8, ACCENT);
  arrowHead(page, o.x + arm, o.y, 1, 0, 4);
  arrowHead(page, o.x, o.y + arm, 0, 1, 4);
  text(ctx, page, '+X', o.x + arm + 2, o.y - 3, 6.5, { color: ACCENT });
  text(ctx, page, '+Y', o.x + 2, o.y + arm + 1, 6.5, { color: ACCENT });
  text(ctx, page, 'DATUM A  X0 Y0 (crank axis)', o.x, o.y - arm - 9, 7, { bold: true, color: ACCENT, align: 'center' });

  // key dimensions: overall size, bolt circles, centre bore
  const bl = P(bb.minX, bb.minY);
  const br = P(bb.maxX, bb.minY);
  const tr = P(bb.maxX, bb.maxY);
  dimension(ctx, page, bl, br, -22, 'x', mm2(wMm));
  dimension(ctx, page, br, tr, 26, 'y', mm2(hMm));
  const notes: string[] = [];
  const centre = profile.holes.find((h) => h.operation === 'centreBore');
  if (centre) {
    const c = P(centre.center.x, centre.center.y);
    const r = (centre.diameterMm / 2) * s;
    const label = `${centre.id} Ø${mm3(centre.diameterMm)}${centre.fit ? ` ${centre.fit.designation}` : ''}`;
    if (ctx.bold.widthOfTextAtSize(clean(ctx, label), 7.5) < 1.6 * r) {
      text(ctx, page, label, c.x, c.y + r * 0.5, 7.5, { align: 'center', bold: true });
    } else {
      const p0 = { x: c.x, y: c.y - r };
      const p1 = { x: c.x, y: c.y - r - 16 };
      line(page, p0.x, p0.y, p1.x, p1.y, 0.4);
      arrowHead(page, p0.x, p0.y, 0, 1, 4);
      text(ctx, page, label, p1.x + 2, p1.y - 8, 7.5, { align: 'center', bold: true });
    }
  }
  for (const bc of boltCircles(profile)) notes.push(`BC Ø${mm3(bc.diameterMm)}: ${bc.ids.length} × ${bc.ids[0]}–${bc.ids[bc.ids.length - 1]}`);
  for (const p of profile.pockets) notes.push(`${p.id}: pocket ${mm2(p.depthMm)} deep from the ${p.fromSide} side, floor flat, corners as drawn`);
  let ny = box.y + box.h - 4;
  text(ctx, page, `PLATE VIEW — seen from the transmission side   SCALE ${scaleLabel(scale)}`, box.x + 4, ny - 8, 8.5, { bold: true });
  ny -= 20;
  for (const n of notes) {
    text(ctx, page, n, box.x + 4, ny, 7.5);
    ny -= 10;
  }
  text(ctx, page, 'Counterbores: solid circle = transmission side, dashed = engine side. Dowel holes in red.', box.x + 4, ny, 6.5, { color: GREY });
  return scale;
}

function drawTitleBlock(ctx: Ctx, page: PDFPage, input: DrawingInput, x: number, y: number, w: number, sheet: number, sheets: number, scale: string): number {
  const { meta, profile } = input;
  const rows: [string, string][] = [
    ['TITLE', meta.title],
    ['PART NO.', meta.partNumber],
    ['REVISION', String(meta.revision)],
    ['STATUS', meta.status],
    ['MATERIAL', meta.material],
    ['THICKNESS', `${mm2(profile.thicknessMm)} mm`],
    ['AUTHOR', meta.author],
    ['APPROVED', meta.approver ? `${meta.approver}${meta.approvedAt ? `, ${meta.approvedAt}` : ''}` : 'not approved'],
    ['SCALE / SHEET', `${scale}   sheet ${sheet} of ${sheets}`],
  ];
  const hashRows: [string, string][] = [['SPEC SHA-256', meta.specSha256], ...meta.fileHashes.map((f) => [f.name, f.sha256] as [string, string])];
  const h = titleBlockHeight(meta);
  rect(page, x, y, w, h, { border: 1 });
  let yy = y + h - 14;
  text(ctx, page, 'PLATEWRIGHT', x + 6, yy, 9, { bold: true, color: ACCENT });
  text(ctx, page, `${meta.partNumber} rev ${meta.revision}`, x + w - 6, yy, 11, { bold: true, align: 'right' });
  yy -= 6;
  line(page, x, yy, x + w, yy, 0.5);
  yy -= 10;
  for (const [k, v] of rows) {
    text(ctx, page, k, x + 6, yy, 6.5, { color: GREY });
    text(ctx, page, v, x + 78, yy, 8, { bold: k === 'PART NO.' || k === 'REVISION' || k === 'STATUS' });
    yy -= 11;
  }
  line(page, x, yy + 7, x + w, yy + 7, 0.3, GREY);
  for (const [k, v] of hashRows) {
    text(ctx, page, k, x + 6, yy - 1, 6, { color: GREY });
    text(ctx, page, v, x + 78, yy - 1, 6.2);
    yy -= 11;
  }
  return h;
}

/** Draws numbered notes under a heading (or, with page = null, only measures them); returns the y below. */
function drawNotes(ctx: Ctx, page: PDFPage | null, heading: string, items: readonly string[], x: number, yTop: number, w: number, size = 7.2): number {
  let y = yTop;
  if (page) text(ctx, page, heading, x, y - 9, 8.5, { bold: true });
  y -= 20;
  items.forEach((item, i) => {
    const lines = wrap(ctx, item, size, w - 12);
    if (page) text(ctx, page, `${i + 1}.`, x, y, size);
    for (const l of lines) {
      if (page) text(ctx, page, l, x + 12, y, size);
      y -= size + 2.6;
    }
    y -= 1.5;
  });
  return y;
}

function titleBlockHeight(meta: DrawingMeta): number {
  return (9 + 1 + meta.fileHashes.length) * 11 + 22;
}

function drawChecks(ctx: Ctx, page: PDFPage, findings: DrawingInput['findings'], x: number, yTop: number, w: number, yMin: number): number {
  const counts = { error: 0, warning: 0, note: 0 };
  for (const f of findings) counts[f.severity]++;
  let y = yTop;
  text(ctx, page, `CHECK SUMMARY — ${counts.error} error(s), ${counts.warning} warning(s), ${counts.note} note(s)`, x, y - 9, 8.5, { bold: true, color: counts.error ? RED : INK });
  y -= 20;
  const order = { error: 0, warning: 1, note: 2 } as const;
  const sorted = [...findings].sort((a, b) => order[a.severity] - order[b.severity]);
  let shown = 0;
  for (const f of sorted) {
    const lines = wrap(ctx, `${f.severity.toUpperCase()} ${f.code}${f.featureIds.length ? ` [${f.featureIds.join(', ')}]` : ''}: ${f.message}`, 6.8, w - 4);
    if (y - lines.length * 9 < yMin) break;
    for (const l of lines) {
      text(ctx, page, l, x + 2, y, 6.8, { color: f.severity === 'error' ? RED : INK });
      y -= 9;
    }
    shown++;
  }
  if (shown < sorted.length) {
    text(ctx, page, `… ${sorted.length - shown} more finding(s): see the revision's check report.`, x + 2, y, 6.8, { color: GREY });
    y -= 9;
  }
  if (sorted.length === 0) {
    text(ctx, page, 'No findings.', x + 2, y, 6.8);
    y -= 9;
  }
  return y;
}

export async function drawingPdf(input: DrawingInput): Promise<Uint8Array> {
  const paper = input.paper ?? 'A3';
  const [W, H] = PAPER_SIZES[paper];
  const doc = await PDFDocument.create();
  doc.registerFontkit(fontkit);
  const [r, b] = await loadFonts();
  const regular = await doc.embedFont(r, { subset: true });
  const bold = await doc.embedFont(b, { subset: true });
  const ctx: Ctx = { doc, regular, bold, chars: new Set(regular.getCharacterSet()) };
  const { meta, profile } = input;
  const title = `${meta.partNumber} rev ${meta.revision} — ${meta.title}`;
  doc.setTitle(clean(ctx, title));
  doc.setAuthor(clean(ctx, meta.author));
  doc.setSubject('Adapter plate drawing');
  doc.setProducer('Platewright');
  doc.setCreator('Platewright');
  const stamp = meta.approvedAt ? new Date(meta.approvedAt) : new Date(0);
  if (!Number.isNaN(stamp.getTime())) {
    doc.setCreationDate(stamp);
    doc.setModificationDate(stamp);
  }

  const margin = 10 * MM;
  const rows = holeTable(profile);
  const rightW = TABLE_WIDTH;
  const rightX = W - margin - 8 - rightW;
  const tbH = titleBlockHeight(meta);
  const tbY = margin + 8;
  const CHECKS_MIN = 80;
  const tableTop = H - margin - 4;
  // rows that fit on sheet 1 above the check summary and title block; the rest continue on
  // further sheets in two columns
  const firstRowsMax = Math.max(5, Math.floor((tableTop - 16 - ROW_H - (tbY + tbH + CHECKS_MIN + 10)) / ROW_H));
  const laterRowsMax = 2 * Math.floor((tableTop - 16 - ROW_H - (tbY + tbH + 10)) / ROW_H);
  const chunks: HoleTableRow[][] = [rows.slice(0, firstRowsMax)];
  for (let i = firstRowsMax; i < rows.length; i += laterRowsMax) chunks.push(rows.slice(i, i + laterRowsMax));
  const sheets = chunks.length;

  // notes under the plate view: material and tolerances on the left, cautions on the right
  const leftW = rightX - margin - 24;
  const noteW = (leftW - 16) / 2;
  const materialNote = `${meta.material}, ${mm2(profile.thicknessMm)} mm thick; ${
    profile.edgeChamferMm > 0 ? `45° edge chamfer ${mm2(profile.edgeChamferMm)} mm on both outer edges` : 'no edge chamfer'
  }.`;
  const notesItems = [materialNote, ...GENERAL_TOLERANCES];
  const notesH = Math.max(
    margin + 120 - drawNotes(ctx, null, '', notesItems, 0, margin + 120, noteW),
    margin + 120 - drawNotes(ctx, null, '', SAFETY_CAUTIONS, 0, margin + 120, noteW),
  );

  let scaleText = '';
  for (let sheet = 1; sheet <= sheets; sheet++) {
    const page = doc.addPage([W, H]);
    rect(page, margin, margin, W - 2 * margin, H - 2 * margin, { border: 1.2 });
    const chunk = chunks[sheet - 1]!;
    if (sheet === 1) {
      const bandTop = margin + 8 + notesH;
      const viewBox = { x: margin + 8, y: bandTop + 6, w: leftW, h: H - margin - 4 - (bandTop + 6) };
      const scale = drawPlateView(ctx, page, profile, meta, viewBox);
      scaleText = scaleLabel(scale);
      line(page, margin, bandTop + 2, rightX - 12, bandTop + 2, 0.5, GREY);
      drawNotes(ctx, page, 'MATERIAL, THICKNESS AND GENERAL TOLERANCES', notesItems, margin + 8, bandTop, noteW);
      drawNotes(ctx, page, 'SAFETY CAUTIONS', SAFETY_CAUTIONS, margin + 8 + noteW + 16, bandTop, noteW);
      line(page, rightX - 12, margin, rightX - 12, H - margin, 0.5, GREY);
      const y = drawTable(ctx, page, chunk, rightX, tableTop, profile.thicknessMm, sheets > 1 ? `HOLE TABLE (continued on sheet 2)` : 'HOLE TABLE');
      drawChecks(ctx, page, input.findings, rightX, y - 4, rightW, tbY + tbH + 6);
      drawTitleBlock(ctx, page, input, rightX, tbY, rightW, sheet, sheets, scaleText);
    } else {
      const half = Math.ceil(chunk.length / 2);
      const x0 = margin + 8;
      drawTable(ctx, page, chunk.slice(0, half), x0, tableTop, profile.thicknessMm, `HOLE TABLE (continued, sheet ${sheet} of ${sheets})`);
      if (chunk.length > half) drawTable(ctx, page, chunk.slice(half), x0 + TABLE_WIDTH + 20, tableTop, profile.thicknessMm, ' ');
      drawTitleBlock(ctx, page, input, W - margin - 8 - rightW, tbY, rightW, sheet, sheets, scaleText);
    }
  }
  return doc.save({ useObjectStreams: false });
}

