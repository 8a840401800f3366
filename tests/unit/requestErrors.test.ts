import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { handle, readBody } from '~/server/errors';
import { parseWith, signInSchema, userPatchSchema } from '~/server/auth/validation';
import { AuthError } from '~/server/auth/errors';

// common practice: an unknown field is a typo or a field of another endpoint; it is refused by its name
const body = (v: unknown) => new Request('http://localhost/x', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(v) });

describe('unknown fields in request bodies', () => {
  it('readBody + handle: 400, the message and fields name the unknown field first', async () => {
    const schema = z.strictObject({ name: z.string(), inner: z.strictObject({ a: z.number() }) });
    const r = await handle(async () => {
      await readBody(body({ name: 1, inner: { a: 1, b: 2 }, colour: 'red' }), schema);
      return new Response('accepted');
    });
    expect(r.status).toBe(400);
    const e = (await r.json()).error;
    expect(e.code).toBe('invalid_input');
    expect(e.fields.colour).toMatch(/^unknown field "colour"/);
    expect(e.fields['inner.b']).toMatch(/^unknown field "inner\.b"/);
    expect(e.fields.name).toBeTruthy();
    expect(e.message).toMatch(/^The request is not valid: unknown field "(colour|inner\.b)"/);
  });

  it('auth schemas are strict: parseWith names the unknown field in the message', () => {
    let err: unknown;
    try {
      parseWith(signInSchema, { email: 'a@example.test', password: 'x', remember: true });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(AuthError);
    expect((err as AuthError).status).toBe(400);
    expect((err as AuthError).message).toMatch(/unknown field "remember"/);
    expect((err as AuthError).fields?.remember).toMatch(/unknown field "remember"/);
    expect(() => parseWith(userPatchSchema, { active: true, role: 'admin', superuser: true })).toThrow(/unknown field "superuser"/);
    // known fields alone still pass
    expect(parseWith(signInSchema, { email: 'A@Example.test', password: 'x' })).toEqual({ email: 'a@example.test', password: 'x' });
  });
});
