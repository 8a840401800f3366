/**
 * The section forms read their text fields with zod/mini schemas through react-hook-form's zod
 * resolver: values come out read, and each refusal lands on its field with the domain's message.
 */
import { describe, expect, it } from 'vitest';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod/mini';
import { lengthText, optionalLengthText } from '../../../src/components/editor/SectionForms';
import { centreBoreSchema } from '../../../src/domain/spec';
import { readLength, shortLengthMessage, type DisplayUnits } from '../../../src/domain/editor/units';

const mm: DisplayUnits = { length: 'mm', fractions: false };
const inch: DisplayUnits = { length: 'in', fractions: true };

type Resolved = { values: Record<string, unknown>; errors: Record<string, { message?: string; type?: string } | undefined> };

/** What react-hook-form gets back from the resolver for these field values (sync, as the section forms read). */
async function resolve(schema: z.ZodMiniType, values: Record<string, unknown>, mode: 'sync' | 'async' = 'sync'): Promise<Resolved> {
  const resolver = zodResolver(schema as never, undefined, { mode });
  return (await resolver(values as never, undefined, { fields: {}, shouldUseNativeValidation: false })) as unknown as Resolved;
}

describe('section form fields through the zod resolver', () => {
  const schema = z.object({
    thickness: lengthText(mm, { positive: true }),
    recessDepth: optionalLengthText(inch, { positive: true }),
    chamfer: lengthText(inch, { min: 0 }),
  });

  it('reads lengths in the display unit; an empty optional field is none', async () => {
    const r = await resolve(schema, { thickness: '0.5in', recessDepth: '', chamfer: '1/16' });
    expect(r.errors).toEqual({});
    // 1 in = 25.4 mm exactly (the 1959 international inch)
    expect(r.values.thickness).toBeCloseTo(12.7, 12);
    expect(r.values.recessDepth).toBeUndefined();
    expect('recessDepth' in r.values).toBe(true);
    expect(r.values.chamfer).toBeCloseTo(25.4 / 16, 12);
  });

  it('puts each refusal on its field with the message the units module words', async () => {
    const r = await resolve(schema, { thickness: '1,5', recessDepth: '-0.1', chamfer: 'deep' });
    expect(r.values).toEqual({});
    expect(r.errors.thickness).toMatchObject({ type: 'custom', message: shortLengthMessage('1,5', 'mm') });
    const negative = readLength('-0.1', inch, { positive: true });
    expect(negative.ok).toBe(false);
    expect(r.errors.recessDepth?.message).toBe(negative.ok ? undefined : negative.message);
    expect(r.errors.chamfer?.message).toBe(shortLengthMessage('deep', 'in'));
  });

  it('refuses a field that is not text with zod\'s English message', async () => {
    const r = await resolve(schema, { thickness: 12, recessDepth: '', chamfer: '0' });
    // zod's English locale wording (zod/v4/locales/en.js)
    expect(r.errors.thickness?.message).toBe('Invalid input: expected string, received number');
  });

  it('a sync read keeps the fields in their order (an async one moves the read text fields last)', async () => {
    const mixed = z.object({ thickness: lengthText(mm, { positive: true }), stock: z.enum(['metric', 'inch', 'any']) });
    const bad = { thickness: '', stock: 'wood' };
    expect(Object.keys((await resolve(mixed, bad)).errors)).toEqual(['thickness', 'stock']);
    expect(Object.keys((await resolve(mixed, bad, 'async')).errors)).toEqual(['stock', 'thickness']);
    const good = { thickness: '12', stock: 'any' };
    expect(Object.keys((await resolve(mixed, good)).values)).toEqual(['thickness', 'stock']);
  });

  it('the plate spec part behind a section reports on the spec\'s own field', async () => {
    const refused = await resolve(centreBoreSchema, { kind: 'register', diameterMm: 80 });
    expect(refused.errors.fit?.message).toBe('a register locates: give its fit (e.g. "H7") or limitsMm');
    const read = await resolve(centreBoreSchema, { kind: 'register', diameterMm: 80, fit: ' H7 ' });
    expect(read.errors).toEqual({});
    expect(read.values).toEqual({ kind: 'register', diameterMm: 80, fit: 'H7' });
  });
});
