import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { canonicalJson } from '../../../src/domain/canonicalJson';
import { parsePlateSpec } from '../../../src/domain/spec';

// The measured-hole and measured-pattern records in the plate spec: optional, strict, and absent
// from (so not changing the canonical JSON and hash of) every spec written without them.

const templatesDir = new URL('../../../templates/plates/', import.meta.url);
const template = (name: string) => JSON.parse(readFileSync(new URL(name, templatesDir), 'utf8'));
const blank = template('blank.json');

const measuredHole = {
  fromUploadId: '12',
  centerU: 81.2,
  centerV: -40.1,
  diameterMm: 11.03,
  rmsMm: 0.011,
  roundnessMm: 0.04,
  points: 210,
  arcCoverageDeg: 355,
  flags: ['oval'],
  nearest: { label: 'ISO 273 medium M10', differenceMm: 0.03 },
};

function withHole(fitted: unknown, patternFitted: unknown = { centerX: 0.2, centerY: 0, rmsMm: 0.01, fromUploadId: '12' }) {
  const spec = structuredClone(blank);
  spec.transmissionFace.patterns = [{ id: 'TB', diameterMm: 180, count: 6, startAngleDeg: 0, fitted: patternFitted }];
  spec.transmissionFace.holes = [{ id: 'T1', role: 'clearance', fastener: 'M10', patternId: 'TB', index: 0, fitted }];
  return spec;
}

const issuesOf = (spec: unknown) => {
  try {
    parsePlateSpec(spec);
    return '';
  } catch (e) {
    return (e as Error).message;
  }
};

describe('measured fit records in the plate spec', () => {
  it('specs written without them parse without them: no key added, canonical JSON and hash unchanged by a round trip', () => {
    for (const file of readdirSync(templatesDir).filter((f) => f.endsWith('.json'))) {
      const spec = parsePlateSpec(template(file));
      const text = canonicalJson(spec);
      for (const face of [spec.engineFace, spec.transmissionFace]) {
        for (const h of face.holes) expect(h, `${file} ${h.id}`).not.toHaveProperty('fitted');
      }
      expect(text).not.toMatch(/"(holeCount|angularRmsDeg|arcCoverageDeg|roundnessMm)"/);
      const again = canonicalJson(parsePlateSpec(JSON.parse(text)));
      expect(createHash('sha256').update(again).digest('hex'), file).toBe(createHash('sha256').update(text).digest('hex'));
    }
  });

  it('an older pattern fit record (centre, rms, upload only) stays valid and unchanged', () => {
    const old = { centerX: 0.2, centerY: -0.1, rmsMm: 0.01, fromUploadId: '3' };
    const spec = withHole(undefined, old);
    delete spec.transmissionFace.holes[0].fitted;
    expect(parsePlateSpec(spec).transmissionFace.patterns[0]!.fitted).toEqual(old);
  });

  it('keeps a hole fit record as given', () => {
    const spec = parsePlateSpec(withHole(measuredHole));
    expect(spec.transmissionFace.holes[0]!.fitted).toEqual(measuredHole);
  });

  it('rejects an unknown field, a wrong flag and impossible figures, each by its path', () => {
    expect(issuesOf(withHole({ ...measuredHole, colour: 'red' }))).toMatch(/transmissionFace\.holes\.0\.fitted\.colour: unknown field "colour"/);
    expect(issuesOf(withHole({ ...measuredHole, flags: ['wobbly'] }))).toMatch(/transmissionFace\.holes\.0\.fitted\.flags\.0: must be one of few-points, short-arc, high-rms, out-of-round, oval, dent/);
    expect(issuesOf(withHole({ ...measuredHole, diameterMm: 0 }))).toMatch(/transmissionFace\.holes\.0\.fitted\.diameterMm: must be greater than 0 mm/);
    expect(issuesOf(withHole({ ...measuredHole, arcCoverageDeg: 400 }))).toMatch(/transmissionFace\.holes\.0\.fitted\.arcCoverageDeg/);
    expect(issuesOf(withHole({ ...measuredHole, points: 10.5 }))).toMatch(/transmissionFace\.holes\.0\.fitted\.points/);
    const { fromUploadId: _u, ...noUpload } = measuredHole;
    expect(issuesOf(withHole(noUpload))).toMatch(/transmissionFace\.holes\.0\.fitted\.fromUploadId: is required/);
    expect(issuesOf(withHole(measuredHole, { centerX: 0, centerY: 0, rmsMm: 0, bore: { offsetMm: 0.1, tirMm: 0.2, runout: 1 } }))).toMatch(/transmissionFace\.patterns\.0\.fitted\.bore\.runout: unknown field/);
    expect(issuesOf(withHole(measuredHole, { centerX: 0, centerY: 0, rmsMm: 0, holeCount: 0 }))).toMatch(/transmissionFace\.patterns\.0\.fitted\.holeCount/);
  });
});
