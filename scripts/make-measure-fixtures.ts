/**
 * Writes the committed measurement samples (tests/fixtures/measure/samples/) from the synthetic
 * faces in tests/fixtures/measure/syntheticFace.ts. Deterministic: running it again gives the
 * same bytes (a unit test checks the committed files against it).
 *
 *   npx tsx scripts/make-measure-fixtures.ts
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { measureSamples } from '../tests/fixtures/measure/samples';

const dir = join(import.meta.dirname, '..', 'tests', 'fixtures', 'measure', 'samples');
mkdirSync(dir, { recursive: true });
for (const [name, bytes] of Object.entries(measureSamples())) {
  writeFileSync(join(dir, name), bytes);
  console.log(`${name}  ${bytes.length.toLocaleString('en-US')} bytes`);
}
