import { z } from 'zod';
import { ROLES } from '../db/schema';
import { AuthError } from './errors';
import { unknownFieldMessage } from '../errors';

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 200;

export const emailSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .min(1, 'Enter an e-mail address.')
  .max(254, 'An e-mail address has at most 254 characters.')
  .pipe(z.email({ error: 'Enter an e-mail address like name@example.test.' }));

export const newPasswordSchema = z
  .string({ error: 'Choose a password.' })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const nameSchema = z
  .string({ error: 'Enter a name.' })
  .trim()
  .min(1, 'Enter a name.')
  .max(200, 'A name has at most 200 characters.');

export const roleSchema = z.enum(ROLES, { error: `Choose a role: ${ROLES.join(', ')}.` });

export const signInSchema = z.strictObject({
  email: emailSchema,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(1000, 'That password is too long.'),
});

export const userPatchSchema = z
  .strictObject({
    role: roleSchema.optional(),
    active: z.boolean({ error: 'active must be true or false.' }).optional(),
  })
  .refine((p) => p.role !== undefined || p.active !== undefined, { error: 'Nothing to change: send role and/or active.' });

export const inviteSchema = z.strictObject({ email: emailSchema, role: roleSchema });

export const acceptInviteSchema = z.strictObject({ name: nameSchema, password: newPasswordSchema });

export const resetRequestSchema = z.strictObject({ email: emailSchema });

export const resetSchema = z.strictObject({ password: newPasswordSchema });

export const accountSchema = z.strictObject({ name: nameSchema });

export const passwordChangeSchema = z.strictObject({
  currentPassword: z.string({ error: 'Enter your current password.' }).min(1, 'Enter your current password.').max(1000),
  newPassword: newPasswordSchema,
});

/** Zod issues as `{ field: message }` (the first message per field; "form" for the whole body; unknown fields by their own name). */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const k of issue.keys) fields[[...issue.path, k].map(String).join('.')] ??= unknownFieldMessage(k);
      continue;
    }
    const key = issue.path.length ? String(issue.path[0]) : 'form';
    fields[key] ??= issue.message;
  }
  return fields;
}

/** Parse with a schema or throw a 400 AuthError naming each bad field. */
export function parseWith<T extends z.ZodType>(schema: T, input: unknown): z.infer<T> {
  const r = schema.safeParse(input);
  if (r.success) return r.data;
  const fields = fieldErrors(r.error);
  const messages = Object.values(fields);
  const first = messages[0] ?? 'Check the highlighted fields.';
  const unknown = messages.filter((m) => m.startsWith('unknown field '));
  const message = messages.length <= 1 ? first : unknown.length ? `Check the highlighted fields; ${unknown.join('; ')}.` : 'Check the highlighted fields.';
  throw new AuthError(400, 'invalid_input', message, fields);
}

/** The JSON body of a request, parsed with a schema; a body that is not JSON is a 400, not a crash. */
export async function readJson<T extends z.ZodType>(request: Request, schema: T): Promise<z.infer<T>> {
  let body: unknown;
  try {
    const text = await request.text();
    body = text.trim() === '' ? {} : JSON.parse(text);
  } catch {
    throw new AuthError(400, 'invalid_json', 'The request body must be JSON, e.g. {"email":"…"}.');
  }
  return parseWith(schema, body);
}
