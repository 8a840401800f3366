import type { APIRoute } from 'astro';
import { z } from 'zod';
import { requireRole } from '~/server/auth/guard';
import { getDb } from '~/server/db/client';
import { handle, idParam, readBody } from '~/server/errors';
import { json } from '~/server/http';
import { createPlate, getPlate, PART_NUMBER_RE, suggestPartNumber } from '~/server/repos/plates';
import { assertProject } from '~/server/repos/projects';

const plateSchema = z.strictObject({
  partNumber: z
    .string()
    .trim()
    .toUpperCase()
    .regex(PART_NUMBER_RE, 'Part numbers use letters, digits and dashes, e.g. PW-0042')
    .optional(),
  title: z.string().trim().min(1, 'Give the plate a title').max(200),
  material: z.string().trim().min(1).max(80).default('6061-T651 aluminium'),
});

/** The next free part number, for the "new plate" form. */
export const GET: APIRoute = ({ locals, params }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    await assertProject(getDb(), g.user, idParam(params.id, 'Project'), 'view');
    return json({ suggestedPartNumber: await suggestPartNumber(getDb()) });
  });

export const POST: APIRoute = ({ locals, params, request }) =>
  handle(async () => {
    const g = requireRole(locals, 'designer', 'engineer', 'admin');
    if (!g.ok) return g.response;
    const body = await readBody(request, plateSchema);
    const { id } = await createPlate(getDb(), g.user, idParam(params.id, 'Project'), body);
    return json({ plate: await getPlate(getDb(), g.user, id) }, 201);
  });
