import { beforeAll, describe, expect, it } from 'vitest';
import { buildPlate, expectedCylindricalFaces, measureVolumeMm3, verifyPlate } from '../../../src/cad/buildPlate';
import { analyseLayout } from '../../../src/cad/plateModel';
import { plateStep, readStep, stepProductName } from '../../../src/cad/step';
import type { OC } from '../../../src/cad/kernel.node.ts';
import { referencePlate } from '../../fixtures/profiles';
import { startTestKernel } from './kernelForTests';

let oc: OC;
beforeAll(async () => {
  oc = await startTestKernel();
});

const meta = { partNumber: 'PW-0042', revision: 3, timestampIso: '2031-05-04T10:20:30', author: 'Ada Quill' };

describe('STEP export', () => {
  it('is AP214 in millimetres with the product named after part number and revision', () => {
    const plate = buildPlate(oc, referencePlate);
    try {
      const text = new TextDecoder().decode(plateStep(oc, plate.shape, meta));
      expect(text.startsWith('ISO-10303-21;')).toBe(true);
      // ISO 10303-214 schema name as OCCT writes it
      expect(text).toMatch(/FILE_SCHEMA\(\('AUTOMOTIVE_DESIGN \{ 1 0 10303 214/);
      expect(text).toContain("PRODUCT('PW-0042 rev 3','PW-0042 rev 3'");
      expect(stepProductName(meta)).toBe('PW-0042 rev 3');
      expect(text).toMatch(/SI_UNIT\(\.MILLI\.,\.METRE\.\)/);
      expect(text).toContain("FILE_NAME('PW-0042-rev3.step','2031-05-04T10:20:30',('Ada Quill')");
    } finally {
      plate.dispose();
    }
  });

  it('reads back into the same solid: volume and one cylindrical face per round feature', () => {
    const plate = buildPlate(oc, referencePlate);
    const back = readStep(oc, plateStep(oc, plate.shape, meta));
    try {
      const v = measureVolumeMm3(oc, back);
      expect(Math.abs(v - plate.verification.volumeMm3) / plate.verification.volumeMm3).toBeLessThan(1e-9);
      const layout = analyseLayout(referencePlate);
      const again = verifyPlate(oc, back, referencePlate, layout.columns);
      expect(again.valid).toBe(true);
      expect(again.cylindricalFaces).toBe(expectedCylindricalFaces(referencePlate, layout.columns));
      expect(again.cylindricalFaces).toBe(53);
    } finally {
      back.delete();
      plate.dispose();
    }
  });

  it('gives the same bytes for the same solid and metadata', () => {
    const plate = buildPlate(oc, referencePlate);
    try {
      const a = plateStep(oc, plate.shape, meta);
      const b = plateStep(oc, plate.shape, meta);
      expect(Buffer.from(a).equals(Buffer.from(b))).toBe(true);
      const c = plateStep(oc, plate.shape, { ...meta, revision: 4 });
      expect(Buffer.from(a).equals(Buffer.from(c))).toBe(false);
    } finally {
      plate.dispose();
    }
  });
});
