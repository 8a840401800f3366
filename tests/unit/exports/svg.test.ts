import { describe, expect, it } from 'vitest';
import sax from 'sax';
import { plateSvg } from '../../../src/domain/exports/svg';
import { referencePlate } from '../../fixtures/profiles';

function parse(svg: string) {
  const parser = sax.parser(true); // strict XML: throws on anything malformed
  const tags: { name: string; attrs: Record<string, string> }[] = [];
  const stack: string[] = [];
  parser.onopentag = (t) => {
    const layer = stack.at(-1) ?? '';
    tags.push({ name: t.name, attrs: { ...(t.attributes as Record<string, string>), _layer: layer } });
    stack.push((t.attributes as Record<string, string>)['data-layer'] ?? layer);
  };
  parser.onclosetag = () => stack.pop();
  parser.write(svg).close();
  return tags;
}

describe('plate SVG', () => {
  const svg = plateSvg(referencePlate, { partNumber: 'PW-0042', revision: 3 });
  const tags = parse(svg);

  it('parses as XML and carries the same features as the DXF', () => {
    expect(tags[0]!.name).toBe('svg');
    expect(tags.filter((t) => t.name === 'circle')).toHaveLength(41);
    // outline + pocket (+ the datum cross)
    expect(tags.filter((t) => t.name === 'path' && t.attrs._layer !== 'datum')).toHaveLength(2);
    expect(tags.find((t) => t.name === 'text')).toBeDefined();
  });

  it('draws arcs as true arcs and flips y for the screen', () => {
    const outline = tags.find((t) => t.name === 'path' && t.attrs['data-id'] === 'outline')!;
    const arcs = outline.attrs.d!.match(/A/g) ?? [];
    expect(arcs).toHaveLength(10);
    const d1 = tags.find((t) => t.name === 'circle' && t.attrs['data-id'] === 'D1')!;
    expect(Number(d1.attrs.cx)).toBe(0);
    expect(Number(d1.attrs.cy)).toBe(-120); // D1 is at y = +120 in plate coordinates
  });

  it('groups features by our layer names', () => {
    const layers = new Set(tags.filter((t) => t.attrs['data-layer']).map((t) => t.attrs['data-layer']));
    for (const l of ['PW_CUT_THRU', 'PW_CBORE_TRN_10.5DP', 'PW_TAPDRILL_M10X1.5', 'PW_POCKET_ENG_4DP', 'PW_ENGRAVE']) expect(layers.has(l)).toBe(true);
  });
});
