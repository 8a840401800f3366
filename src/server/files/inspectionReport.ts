/**
 * Inspection report (PDF, pdf-lib, A4 landscape): part, revision, spec and file hashes, result,
 * the feature table (nominal, measured, deviation, tolerance, result — as words, not colour
 * alone), a plot of the position deviations as exaggerated vectors on the plate outline,
 * signature lines for machinist and engineer, and the safety cautions.
 * Font: Source Sans 3 (shipped with the app), embedded from its WOFF files through fontkit.
 */
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import fontkit from '@pdf-lib/fontkit';
import { PDFDocument, type PDFFont, type PDFPage, rgb } from 'pdf-lib';
import type { PlateProfile, OutlineSegment } from '../../domain/profileTypes';
import type { FeatureResult, InspectionResult } from '../../domain/inspection';
import { SAFETY_CAUTIONS } from './drawing';

export interface InspectionReportInput {
  readonly inspectionId: number;
  readonly state: string;
  readonly partNumber: string;
  readonly title: string;
  readonly material: string;
  readonly revision: number;
  readonly revisionAuthor: string;
  readonly specSha256: string;
  readonly fileHashes: readonly { readonly name: string; readonly sha256: string }[];
  readonly machinist: string;
  readonly engineer?: string | null;
  readonly acceptComment?: string | null;
  readonly startedAt: string;
  readonly completedAt?: string | null;
  readonly acceptedAt?: string | null;
  readonly profile: PlateProfile;
  readonly result: InspectionResult;
}

const MM = 72 / 25.4;
const W = 297 * MM;
const H = 210 * MM;
const INK = rgb(0.1, 0.12, 0.14);
const GREY = rgb(0.45, 0.47, 0.5);
const LIGHT = rgb(0.86, 0.87, 0.89);
const RED = rgb(0.72, 0.1, 0.08);
const GREEN = rgb(0.1, 0.45, 0.2);
const AMBER = rgb(0.62, 0.42, 0.02);

interface Ctx {
  doc: PDFDocument;
  regular: PDFFont;
  bold: PDFFont;
  chars: Set<number>;
}

function fontPath(weight: 400 | 600): string {
  return createRequire(import.meta.url).resolve(`@fontsource/source-sans-3/files/source-sans-3-latin-${weight}-normal.woff`);
}
let fontBytes: Promise<[Uint8Array, Uint8Array]> | null = null;
function loadFonts() {
  fontBytes ??= Promise.all([readFile(fontPath(400)), readFile(fontPath(600))]).then(([a, b]) => [new Uint8Array(a), new Uint8Array(b)] as [Uint8Array, Uint8Array]);
  return fontBytes;
}

function clean(ctx: Ctx, s: string): string {
  const map: Record<string, string> = { '≥': '>=', '≤': '<=', '·': '.', '−': '-', '√': 'sqrt', '≈': '~', '→': '->', 'Δ': 'd' };
  let out = '';
  for (const ch of s) {
    const cp = ch.codePointAt(0)!;
    out += ctx.chars.has(cp) ? ch : (map[ch] ?? (cp < 128 ? ch : '?'));
  }
  return out;
}

function text(ctx: Ctx, page: PDFPage, s: string, x: number, y: number, size: number, opts: { bold?: boolean; color?: ReturnType<typeof rgb>; align?: 'left' | 'right' } = {}) {
  const font = opts.bold ? ctx.bold : ctx.regular;
  const str = clean(ctx, s);
  const dx = opts.align === 'right' ? -font.widthOfTextAtSize(str, size) : 0;
  page.drawText(str, { x: x + dx, y, size, font, color: opts.color ?? INK });
}

function wrap(ctx: Ctx, s: string, size: number, width: number): string[] {
  const words = clean(ctx, s).split(/\s+/);
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    const t = line ? `${line} ${w}` : w;
    if (ctx.regular.widthOfTextAtSize(t, size) > width && line) {
      lines.push(line);
      line = w;
    } else line = t;
  }
  if (line) lines.push(line);
  return lines;
}

const f3 = (v: number | null | undefined) => (v === null || v === undefined ? '—' : (Math.round(v * 1000) / 1000).toFixed(3).replace(/^-0\.000$/, '0.000'));
const sgn = (v: number | null | undefined) => (v === null || v === undefined ? '—' : `${v >= 0 ? '+' : ''}${f3(v)}`);
const RESULT_WORD: Record<string, string> = { pass: 'PASS', fail: 'FAIL', not_measured: 'not measured' };
const STATE_WORD: Record<string, string> = { in_progress: 'IN PROGRESS', passed: 'PASSED', failed: 'FAILED', accepted_with_deviation: 'ACCEPTED WITH DEVIATION' };

interface Line {
  feature: string;
  check: string;
  nominal: string;
  measured: string;
  deviation: string;
  tolerance: string;
  result: string;
  fail: boolean;
}

/** One or more table lines per feature: position, size, depth; pattern; thickness points; flatness. */
export function reportLines(features: readonly FeatureResult[]): Line[] {
  const out: Line[] = [];
  for (const f of features) {
    const word = RESULT_WORD[f.result]!;
    if (f.kind === 'hole') {
      const m = f.measured;
      const posFail = f.truePositionMm !== null && f.truePositionMm > f.positionToleranceMm + 1e-9;
      out.push({ feature: f.featureId, check: 'position (TP)', nominal: `${f3(f.nominal.x)}, ${f3(f.nominal.y)}`, measured: m.x !== undefined ? `${f3(m.x)}, ${f3(m.y)}` : '—', deviation: f.truePositionMm !== null ? `TP ${f3(f.truePositionMm)}` : '—', tolerance: `Ø${f3(f.positionToleranceMm)}`, result: f.truePositionMm === null ? 'not measured' : posFail ? 'FAIL' : 'PASS', fail: posFail });
      const sizeFail = m.diameter !== undefined && (m.diameter < f.size.lowerMm - 1e-9 || m.diameter > f.size.upperMm + 1e-9);
      out.push({ feature: '', check: 'size Ø', nominal: f3(f.nominal.diameterMm), measured: m.diameter !== undefined ? f3(m.diameter) : '—', deviation: sgn(f.sizeDeviationMm), tolerance: `${f.size.label} (${f3(f.size.lowerMm)}…${f3(f.size.upperMm)})`, result: m.diameter === undefined ? 'not measured' : sizeFail ? 'FAIL' : 'PASS', fail: sizeFail });
      if (f.depthLimit && m.depth !== undefined) {
        const dFail = m.depth < f.depthLimit.lowerMm - 1e-9 || m.depth > f.depthLimit.upperMm + 1e-9;
        out.push({ feature: '', check: `${f.depthLimit.what} depth`, nominal: f3(f.nominal.depthMm), measured: f3(m.depth), deviation: sgn(f.depthDeviationMm), tolerance: f.depthLimit.label, result: dFail ? 'FAIL' : 'PASS', fail: dFail });
      }
    } else if (f.kind === 'pattern') {
      out.push({ feature: f.featureId, check: 'bolt-circle centre', nominal: `${f3(f.nominalCentre.x)}, ${f3(f.nominalCentre.y)}`, measured: f.fittedCentre ? `${f3(f.fittedCentre.x)}, ${f3(f.fittedCentre.y)}` : '—', deviation: f.concentricityMm !== null ? `Ø${f3(f.concentricityMm)}` : '—', tolerance: `Ø${f3(f.toleranceMm)} (TIR)`, result: word, fail: f.result === 'fail' });
    } else if (f.kind === 'thickness') {
      for (const p of f.points) out.push({ feature: p.featureId, check: 'thickness', nominal: f3(f.nominalMm), measured: f3(p.valueMm), deviation: sgn(p.valueMm - f.nominalMm), tolerance: f.limit.label, result: p.pass ? 'PASS' : 'FAIL', fail: !p.pass });
      out.push({ feature: 'THK', check: 'thickness range', nominal: '', measured: f.rangeMm !== null ? `${f3(f.minMm)}…${f3(f.maxMm)}` : '—', deviation: f.rangeMm !== null ? f3(f.rangeMm) : '—', tolerance: `${f3(f.limit.lowerMm)}…${f3(f.limit.upperMm)}`, result: word, fail: f.result === 'fail' });
    } else {
      out.push({ feature: 'FLAT', check: f.points >= 3 ? `flatness (${f.points} points${f.readingMm !== null ? ' + reading' : ''})` : 'flatness', nominal: '0', measured: f3(f.flatnessMm), deviation: f3(f.flatnessMm), tolerance: f3(f.toleranceMm), result: word, fail: f.result === 'fail' });
    }
  }
  return out;
}

function segmentPoints(s: OutlineSegment): { x: number; y: number }[] {
  if (s.kind === 'line') return [s.start, s.end];
  const a0 = Math.atan2(s.start.y - s.center.y, s.start.x - s.center.x);
  let a1 = Math.atan2(s.end.y - s.center.y, s.end.x - s.center.x);
  if (s.ccw && a1 <= a0) a1 += 2 * Math.PI;
  if (!s.ccw && a1 >= a0) a1 -= 2 * Math.PI;
  const n = Math.max(4, Math.ceil(Math.abs(a1 - a0) / (Math.PI / 36)));
  return Array.from({ length: n + 1 }, (_, i) => {
    const a = a0 + ((a1 - a0) * i) / n;
    return { x: s.center.x + s.radiusMm * Math.cos(a), y: s.center.y + s.radiusMm * Math.sin(a) };
  });
}

function plot(ctx: Ctx, page: PDFPage, input: InspectionReportInput, x0: number, y0: number, w: number, h: number) {
  const { profile, result } = input;
  const b = profile.bbox;
  const scale = Math.min(w / (b.maxX - b.minX), (h - 24) / (b.maxY - b.minY));
  const cx = x0 + w / 2 - ((b.minX + b.maxX) / 2) * scale;
  const cy = y0 + (h - 24) / 2 - ((b.minY + b.maxY) / 2) * scale;
  const P = (p: { x: number; y: number }) => ({ x: cx + p.x * scale, y: cy + p.y * scale });
  for (const s of profile.outline) {
    const pts = segmentPoints(s).map(P);
    for (let i = 1; i < pts.length; i++) page.drawLine({ start: pts[i - 1]!, end: pts[i]!, thickness: 0.8, color: INK });
  }
  const holes = result.features.filter((f) => f.kind === 'hole');
  const devs = holes.map((f) => Math.hypot(f.dxMm ?? 0, f.dyMm ?? 0)).filter((v) => v > 0);
  const maxDev = devs.length ? Math.max(...devs) : 0;
  // the largest vector drawn 12 % of the plate's larger side long; the factor is printed
  const target = 0.12 * Math.max(b.maxX - b.minX, b.maxY - b.minY);
  const exaggeration = maxDev > 0 ? Math.max(1, Math.round(target / maxDev / 10) * 10) : 1;
  for (const hole of profile.holes) {
    const c = P(hole.center);
    page.drawCircle({ x: c.x, y: c.y, size: Math.max(1, (hole.diameterMm / 2) * scale), borderWidth: 0.4, borderColor: GREY });
  }
  for (const f of holes) {
    if (f.dxMm === null || f.dyMm === null) continue;
    const s = P(f.nominal);
    const e = P({ x: f.nominal.x + f.dxMm * exaggeration, y: f.nominal.y + f.dyMm * exaggeration });
    const color = f.result === 'fail' ? RED : GREEN;
    page.drawLine({ start: s, end: e, thickness: f.result === 'fail' ? 1.6 : 1, color });
    page.drawCircle({ x: e.x, y: e.y, size: 1.4, color });
    if (f.result === 'fail') text(ctx, page, `${f.featureId} FAIL`, e.x + 3, e.y + 2, 7, { bold: true, color: RED });
  }
  text(ctx, page, `Position deviations, vectors × ${exaggeration} (nominal → measured, plate coordinates, seen from the transmission side)`, x0, y0 + h - 8, 7.5, { color: GREY });
  return exaggeration;
}

export async function inspectionReportPdf(input: InspectionReportInput): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.registerFontkit(fontkit);
  const [r, b] = await loadFonts();
  const regular = await doc.embedFont(r, { subset: true });
  const bold = await doc.embedFont(b, { subset: true });
  const ctx: Ctx = { doc, regular, bold, chars: new Set(regular.getCharacterSet()) };
  const title = `Inspection report ${input.partNumber} rev ${input.revision}`;
  doc.setTitle(clean(ctx, title));
  doc.setSubject('As-machined inspection against the released revision');
  doc.setProducer('Platewright');
  doc.setCreator('Platewright');
  const m = 12 * MM;
  const stateWord = STATE_WORD[input.state] ?? input.state;
  const stateColor = input.state === 'passed' ? GREEN : input.state === 'failed' ? RED : input.state === 'accepted_with_deviation' ? AMBER : GREY;

  // ── page 1: header, plot, summary, signatures, cautions
  let page = doc.addPage([W, H]);
  text(ctx, page, title, m, H - m - 6, 16, { bold: true });
  text(ctx, page, `${input.title} · ${input.material} · inspection #${input.inspectionId}`, m, H - m - 22, 9.5, { color: GREY });
  text(ctx, page, `Result: ${stateWord}`, W - m, H - m - 6, 14, { bold: true, color: stateColor, align: 'right' });
  const failing = input.result.failing;
  text(ctx, page, failing.length ? `Out of tolerance: ${failing.join(', ')}` : `${input.result.counts.pass} checks pass`, W - m, H - m - 22, 9.5, { bold: failing.length > 0, color: failing.length ? RED : INK, align: 'right' });

  const plotW = W * 0.52;
  const plotTop = H - m - 36;
  const plotH = plotTop - m - 10;
  plot(ctx, page, input, m, m, plotW, plotH);

  const rx = m + plotW + 14;
  const rw = W - m - rx;
  let y = plotTop - 4;
  const kv = (k: string, v: string, mono = false) => {
    text(ctx, page, k, rx, y, 7.5, { color: GREY });
    for (const line of wrap(ctx, v, mono ? 6.8 : 8.5, rw - 70)) {
      text(ctx, page, line, rx + 70, y, mono ? 6.8 : 8.5);
      y -= 10;
    }
  };
  kv('Part', `${input.partNumber} rev ${input.revision} (designer ${input.revisionAuthor})`);
  kv('Machinist', input.machinist);
  kv('Started', input.startedAt.slice(0, 16).replace('T', ' ') + ' UTC');
  kv('Completed', input.completedAt ? input.completedAt.slice(0, 16).replace('T', ' ') + ' UTC' : 'not yet');
  if (input.engineer) kv('Accepted by', `${input.engineer}${input.acceptedAt ? `, ${input.acceptedAt.slice(0, 10)}` : ''}`);
  if (input.acceptComment) kv('Deviation', input.acceptComment);
  kv('Spec SHA-256', input.specSha256, true);
  for (const f of input.fileHashes) kv(f.name, f.sha256, true);
  y -= 8;
  // signatures
  for (const who of [`Machinist: ${input.machinist}`, `Engineer${input.engineer ? `: ${input.engineer}` : ''}`]) {
    page.drawLine({ start: { x: rx, y }, end: { x: rx + rw * 0.62, y }, thickness: 0.6, color: INK });
    page.drawLine({ start: { x: rx + rw * 0.68, y }, end: { x: rx + rw, y }, thickness: 0.6, color: INK });
    text(ctx, page, `${who} — signature`, rx, y - 9, 7.5, { color: GREY });
    text(ctx, page, 'date', rx + rw * 0.68, y - 9, 7.5, { color: GREY });
    y -= 30;
  }
  y += 8;
  text(ctx, page, 'Before this part runs', rx, y, 8.5, { bold: true });
  y -= 10;
  for (const c of SAFETY_CAUTIONS) {
    for (const line of wrap(ctx, `• ${c}`, 6.8, rw)) {
      if (y < m) break;
      text(ctx, page, line, rx, y, 6.8);
      y -= 8.2;
    }
  }

  // ── table pages
  const cols: [Exclude<keyof Line, 'fail'>, string, number][] = [
    ['feature', 'Feature', 50],
    ['check', 'Check', 110],
    ['nominal', 'Nominal (mm)', 110],
    ['measured', 'Measured (mm)', 110],
    ['deviation', 'Deviation', 80],
    ['tolerance', 'Tolerance', 170],
    ['result', 'Result', 60],
  ];
  const lines = reportLines(input.result.features);
  const rowH = 11.5;
  let i = 0;
  let sheet = 1;
  while (i < lines.length) {
    page = doc.addPage([W, H]);
    sheet++;
    text(ctx, page, `${title} — features (sheet ${sheet})`, m, H - m - 6, 11, { bold: true });
    text(ctx, page, 'TP = 2·√(Δx² + Δy²), diameter zone (ASME Y14.5). Size limits: ISO 286 for fitted features, else ± the spec’s general tolerance. Result in words; failing rows in red.', m, H - m - 20, 7.5, { color: GREY });
    y = H - m - 38;
    let x = m;
    for (const [, label, w] of cols) {
      text(ctx, page, label, x + 2, y, 8, { bold: true });
      x += w;
    }
    y -= 4;
    page.drawLine({ start: { x: m, y }, end: { x: W - m, y }, thickness: 0.8, color: INK });
    y -= rowH - 2;
    while (i < lines.length && y > m + 4) {
      const l = lines[i]!;
      if (l.feature) page.drawLine({ start: { x: m, y: y + rowH - 3 }, end: { x: W - m, y: y + rowH - 3 }, thickness: 0.3, color: LIGHT });
      x = m;
      for (const [key, , w] of cols) {
        const isResult = key === 'result';
        text(ctx, page, l[key], x + 2, y, 8, { bold: isResult || (key === 'feature' && l.fail), color: l.fail ? RED : isResult && l.result === 'PASS' ? GREEN : INK });
        x += w;
      }
      y -= rowH;
      i++;
    }
  }
  return doc.save();
}
