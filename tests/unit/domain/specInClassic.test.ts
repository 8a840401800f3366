/**
 * Server code keeps classic zod and may put the plate spec's zod/mini schemas inside its own
 * request schemas: both share zod's core, so the parse, the defaults, the issue paths and the
 * error class the endpoints answer as 400 are those of the classic schema around them.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { parsePlateSpec, plateSpecSchema } from '../../../src/domain/spec';
import { stackUpInputsSchema } from '../../../src/domain/stackUp';
import { baseInput } from './plateFixture';

describe('the plate spec inside a classic request schema', () => {
  // a mini schema has no classic methods (`.optional()`, `.extend()` …): wrap it with classic's functions
  const body = z.strictObject({ note: z.string().max(20).optional(), spec: plateSpecSchema, stackUp: z.optional(stackUpInputsSchema) });

  it('parses and fills the same defaults as on its own', () => {
    const parsed = body.parse({ spec: baseInput(), stackUp: { plateThickness: { crankFlangePositionMm: { nominalMm: 1 }, flywheelDepthMm: { nominalMm: 30 }, requiredBellFaceToFrictionFaceMm: { nominalMm: 12 } } } });
    expect(parsed.spec).toEqual(parsePlateSpec(baseInput()));
    expect(parsed.stackUp?.plateThickness?.flywheelDepthMm).toEqual({ nominalMm: 30, plusMm: 0, minusMm: 0 });
  });

  it('refuses with classic zod errors whose paths start at the request field', () => {
    const spec = baseInput() as any;
    spec.engineFace.holes[0].colour = 'red';
    spec.thicknessMm = 250;
    const r = body.safeParse({ spec, note: 'x'.repeat(21) });
    expect(r.success).toBe(false);
    expect(r.error).toBeInstanceOf(z.ZodError);
    expect(r.error!.issues.map((i) => [i.path.join('.'), i.code, i.message])).toEqual([
      ['note', 'too_big', 'Too big: expected string to have <=20 characters'],
      ['spec.engineFace.holes.0', 'unrecognized_keys', 'Unrecognized key: "colour"'],
      ['spec.thicknessMm', 'too_big', 'must be at most 200 mm'],
    ]);
    // thrown from a classic parse, the endpoints' handler recognises it as a zod error
    expect(() => body.parse({ spec })).toThrow(z.ZodError);
  });

  it('classic object helpers keep working around it', () => {
    const withId = body.extend({ id: z.int().positive() }).pick({ id: true, spec: true });
    expect(withId.safeParse({ id: 3, spec: baseInput() }).success).toBe(true);
    expect(withId.safeParse({ id: 3, spec: { ...baseInput(), schemaVersion: 2 } }).error?.issues[0]).toMatchObject({ path: ['spec', 'schemaVersion'], message: 'must be 1 (this version of the plate spec)' });
  });
});
