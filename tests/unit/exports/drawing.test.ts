import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, writeFileSync, existsSync, statSync } from 'node:fs';
import { extractText, getDocumentProxy } from 'unpdf';
import { drawingPdf, PAPER_SIZES, SAFETY_CAUTIONS, boltCircles } from '../../../src/server/files/drawing';
import { referencePlate } from '../../fixtures/profiles';

const meta = {
  partNumber: 'PW-0042',
  revision: 3,
  status: 'approved',
  title: 'Adapter plate, invented inline-4 to invented 5-speed',
  material: '6061-T651 aluminium plate',
  author: 'Ada Quill',
  approver: 'Bram Okonkwo',
  approvedAt: '2031-05-04',
  specSha256: '3f'.repeat(32),
  fileHashes: [
    { name: 'PW-0042-rev3.step', sha256: 'a1'.repeat(32) },
    { name: 'PW-0042-rev3.dxf', sha256: 'b2'.repeat(32) },
  ],
};
const findings = [
  { severity: 'warning' as const, code: 'edge.recommended', message: 'S2 is 6.5 mm from the edge; 1.5·d0 recommended.', featureIds: ['S2'] },
  { severity: 'note' as const, code: 'dowel.fit', message: 'D1 Ø10 H7 with an m6 dowel: −0.015 … +0.009 mm.', featureIds: ['D1'] },
];

async function pdfText(bytes: Uint8Array): Promise<{ pages: number; text: string }> {
  const pdf = await getDocumentProxy(new Uint8Array(bytes));
  const { totalPages, text } = await extractText(pdf, { mergePages: true });
  return { pages: totalPages, text: text.replace(/\s+/g, ' ') };
}

describe('drawing PDF', () => {
  it('A3 landscape: hole table rows, revision, hashes, tolerances and the cautions are in the text', async () => {
    const bytes = await drawingPdf({ profile: referencePlate, findings, meta, paper: 'A3' });
    const pdf = await getDocumentProxy(new Uint8Array(bytes));
    const page = await pdf.getPage(1);
    const [, , w, h] = page.view;
    // A3 landscape 420 × 297 mm (ISO 216) in points
    expect(w).toBeCloseTo(420 * 72 / 25.4, 1);
    expect(h).toBeCloseTo(297 * 72 / 25.4, 1);
    const { text } = await pdfText(bytes);
    // rows of the hole table: E1 at 120 mm radius, 15° (fixture) → 115.911, 31.058
    expect(text).toMatch(/E1 115\.911 31\.058 11\.000 drill thru engine THRU ISO 2768-m/);
    expect(text).toMatch(/E1 115\.911 31\.058 18\.000 counterbore trans\. 10\.50/);
    expect(text).toMatch(/D1 0\.000 120\.000 10\.000 ream \(dowel\) engine THRU H7 10\.000 \/ 10\.015/);
    expect(text).toMatch(/T1 97\.500 0\.000 8\.500 tap drill trans\. M10x1\.5 x 12\.70 THRU 6H/);
    expect(text).toContain('PW-0042 rev 3');
    expect(text).toContain('3f'.repeat(32));
    expect(text).toContain('a1'.repeat(32));
    expect(text).toContain('Bram Okonkwo, 2031-05-04');
    expect(text).toContain('6061-T651 aluminium plate, 12.70 mm thick');
    expect(text).toContain('ISO 2768-m');
    expect(text).toMatch(/CHECK SUMMARY — 0 error\(s\), 1 warning\(s\), 1 note\(s\)/);
    expect(text).toContain('edge.recommended');
    for (const c of ['scatter shield', 'dial indicator', 'torque', 'thread locker', 'licensed engineering practice']) expect(text).toContain(c);
    expect(SAFETY_CAUTIONS.join(' ')).toContain('runout');
    // key dimensions: overall size and both bolt circles
    expect(text).toContain('320.00');
    expect(text).toContain('280.00');
    expect(text).toContain('BC Ø240.000');
    expect(text).toContain('BC Ø195.000');
    expect(text).toContain('C1 Ø90.000 H8');

    // page 1 as a picture, for a person to look at
    mkdirSync('.test-artifacts', { recursive: true });
    writeFileSync('.test-artifacts/drawing-A3.pdf', bytes);
    execFileSync('pdftoppm', ['-png', '-r', '110', '-f', '1', '-l', '1', '-singlefile', '.test-artifacts/drawing-A3.pdf', '.test-artifacts/drawing-A3']);
    expect(existsSync('.test-artifacts/drawing-A3.png')).toBe(true);
    expect(statSync('.test-artifacts/drawing-A3.png').size).toBeGreaterThan(50_000);
  });

  it('US Tabloid landscape, unapproved draft', async () => {
    const bytes = await drawingPdf({ profile: referencePlate, findings: [], meta: { ...meta, status: 'draft', approver: null, approvedAt: null }, paper: 'tabloid' });
    const pdf = await getDocumentProxy(new Uint8Array(bytes));
    const [, , w, h] = (await pdf.getPage(1)).view;
    expect([w, h]).toEqual(PAPER_SIZES.tabloid); // 17 × 11 in
    const { text } = await pdfText(bytes);
    expect(text).toContain('not approved');
    expect(text).toContain('No findings.');
  });

  it('continues a long hole table on a second sheet', async () => {
    const many = {
      ...referencePlate,
      holes: [
        ...referencePlate.holes,
        ...Array.from({ length: 40 }, (_, i) => ({
          id: `X${i + 1}`, face: 'plate' as const, operation: 'through' as const,
          center: { x: -60 + (i % 10) * 12, y: 150 + Math.floor(i / 10) * 12 }, diameterMm: 4, depthMm: null, fromSide: 'engine' as const,
        })),
      ],
    };
    const bytes = await drawingPdf({ profile: many, findings, meta });
    const { pages, text } = await pdfText(bytes);
    expect(pages).toBe(2);
    expect(text).toContain('HOLE TABLE (continued on sheet 2)');
    expect(text).toMatch(/X40 48\.000 186\.000 4\.000 drill thru/);
    expect(text).toContain('sheet 2 of 2');
  });

  it('finds the bolt circles of the patterns', () => {
    const bcs = boltCircles(referencePlate);
    expect(bcs.map((b) => Math.round(b.diameterMm * 1000) / 1000)).toEqual([240, 195]);
    expect(bcs[0]!.ids).toHaveLength(12);
  });
});
