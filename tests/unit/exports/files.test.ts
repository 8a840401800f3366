import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import DxfParser from 'dxf-parser';
import { extractText, getDocumentProxy } from 'unpdf';
import { contentDisposition, downloadFileName, renderFile, renderRevisionFiles, REVISION_FILE_NAMES } from '../../../src/server/files/index';
import { simplePlate } from '../../fixtures/profiles';

const input = {
  profile: simplePlate,
  findings: [],
  meta: {
    partNumber: 'PW-0007',
    revision: 1,
    status: 'approved',
    title: 'Test plate',
    material: '6061-T651 aluminium plate',
    author: 'Ada Quill',
    approver: 'Bram Okonkwo',
    approvedAt: '2031-05-04',
    specSha256: '9c'.repeat(32),
  },
};

describe('revision files', () => {
  it('renders all five with content types, names and hashes; the drawing lists the others', async () => {
    const { files, kernelVersion } = await renderRevisionFiles(input);
    expect(files.map((f) => f.name)).toEqual([...REVISION_FILE_NAMES]);
    expect(files.map((f) => f.fileName)).toEqual(['PW-0007-rev1.step', 'PW-0007-rev1.dxf', 'PW-0007-rev1.pdf', 'PW-0007-rev1.svg', 'PW-0007-rev1-holes.csv']);
    expect(files.map((f) => f.contentType)).toEqual(['model/step', 'image/vnd.dxf', 'application/pdf', 'image/svg+xml', 'text/csv; charset=utf-8']);
    for (const f of files) expect(f.sha256).toBe(createHash('sha256').update(f.bytes).digest('hex'));
    expect(kernelVersion).toMatch(/replicad 1\.1\.0/);
    const text = new TextDecoder().decode(files[0]!.bytes);
    expect(text).toContain("PRODUCT('PW-0007 rev 1'");
    expect(new DxfParser().parseSync(new TextDecoder().decode(files[1]!.bytes))!.header['$INSUNITS']).toBe(4);
    const pdf = await getDocumentProxy(new Uint8Array(files[2]!.bytes));
    const { text: pdfText } = await extractText(pdf, { mergePages: true });
    for (const f of files.filter((x) => x.name !== 'drawing.pdf')) expect(pdfText).toContain(f.sha256);
  });

  it('renders the same bytes again for the same revision (deterministic)', async () => {
    const a = await renderFile('plate.step', input);
    const b = await renderFile('plate.step', input);
    expect(a.sha256).toBe(b.sha256);
    const c = await renderFile('holes.csv', input);
    expect(new TextDecoder().decode(c.bytes).split('\r\n')[0]).toBe('id,face,operation,x_mm,y_mm,diameter_mm,thread,depth_mm');
  });

  it('builds download names and headers', () => {
    expect(downloadFileName('PW-0042', 3, 'plate.dxf')).toBe('PW-0042-rev3.dxf');
    expect(downloadFileName('PW 42/a', 'B', 'drawing.pdf')).toBe('PW_42_a-revB.pdf');
    expect(contentDisposition('PW-0042-rev3.dxf')).toBe(`attachment; filename="PW-0042-rev3.dxf"; filename*=UTF-8''PW-0042-rev3.dxf`);
  });
});
