/**
 * Inspections: a machinist records the as-machined plate against an approved revision; the
 * result is computed by the domain on every save; an engineer may accept a failed part with a
 * written deviation. Every state change is an audit event, in the same transaction.
 */
import { and, asc, desc, eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { artifacts, inspections, plates, revisions, users, type InspectionState } from '../db/schema';
import type { SessionUser } from '../auth/types';
import { AppError, forbidden, notFound } from '../errors';
import { audit } from './audit';
import { assertPlateView } from './plates';
import { findRevision } from './revisions';
import { profileOf, validateSpec } from '../plateEngine';
import {
  evaluateInspection,
  inspectionPlanFor,
  resultSummary,
  rowProblems,
  measurementRowSchema,
  type InspectionPlan,
  type InspectionResult,
  type MeasurementRow,
  type RowError,
} from '~/domain/inspection';
import type { PlateProfile } from '~/domain';
import { z } from 'zod';

export interface InspectionRow {
  id: number;
  revisionId: number;
  plateId: number;
  machinistId: string;
  state: InspectionState;
  specSha256: string;
  artifactHashes: unknown;
  measurements: unknown;
  results: unknown;
  note: string | null;
  acceptedById: string | null;
  acceptComment: string | null;
  createdAt: Date;
  updatedAt: Date;
  completedAt: Date | null;
  acceptedAt: Date | null;
}

const SHOP_ROLES = ['machinist', 'engineer', 'admin'];

/** The plan (features and limits) of a revision, from its stored spec. */
export function planOfRevision(spec: unknown): { plan: InspectionPlan; profile: PlateProfile } {
  const parsed = validateSpec(spec);
  const profile = profileOf(parsed);
  return { plan: inspectionPlanFor(profile, parsed.tolerances, spec), profile };
}

const storedRowsSchema = z.array(measurementRowSchema);

function storedRows(v: unknown): MeasurementRow[] {
  const r = storedRowsSchema.safeParse(v);
  return r.success ? r.data : [];
}

async function findInspection(db: Db | Tx, id: number, forUpdate = false): Promise<InspectionRow | undefined> {
  const q = db.select().from(inspections).where(eq(inspections.id, id)).limit(1);
  const [r] = forUpdate ? await q.for('update') : await q;
  return r as InspectionRow | undefined;
}

/** Shop roles see every inspection; a designer sees those of plates they can view. */
async function assertInspectionView(db: Db, user: SessionUser, row: InspectionRow | undefined): Promise<InspectionRow> {
  if (!row) throw notFound('Inspection');
  if (!SHOP_ROLES.includes(user.role)) {
    await assertPlateView(db, user, row.plateId).catch(() => {
      throw notFound('Inspection');
    });
  }
  return row;
}

export async function startInspection(db: Db, user: SessionUser, revisionId: number, note?: string) {
  if (user.role !== 'machinist') throw forbidden(`Inspections are started by a machinist; you are signed in as ${user.role}.`);
  const r = await findRevision(db, revisionId);
  // machinists see released revisions only: anything else is "not found" to them
  if (!r || r.status !== 'approved') throw new AppError(404, 'not_found', 'Released revision not found: inspections are recorded against approved (released) revisions only.');
  planOfRevision(r.spec); // a spec the domain cannot lay out cannot be inspected (400 from validateSpec)
  const files = await db.select({ name: artifacts.kind, sha256: artifacts.sha256 }).from(artifacts).where(eq(artifacts.revisionId, revisionId)).orderBy(asc(artifacts.kind));
  return db.transaction(async (tx) => {
    const [ins] = await tx
      .insert(inspections)
      .values({ revisionId, plateId: r.plateId, machinistId: user.id, state: 'in_progress', specSha256: r.specSha256, artifactHashes: files, measurements: [], results: null, note: note ?? null })
      .$returningId();
    await audit(tx, user.id, 'inspection.started', { type: 'inspection', id: ins.id }, { revisionId, plateId: r.plateId, specSha256: r.specSha256, files });
    return ins.id;
  });
}

export async function getInspection(db: Db, user: SessionUser, id: number) {
  const row = await assertInspectionView(db, user, await findInspection(db, id));
  const r = (await findRevision(db, row.revisionId))!;
  const [plate] = await db.select().from(plates).where(eq(plates.id, row.plateId));
  const names = new Map<string, { name: string; email: string }>();
  for (const uid of [row.machinistId, row.acceptedById, r.authorId].filter((x): x is string => !!x)) {
    const [u] = await db.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, uid));
    if (u) names.set(uid, u);
  }
  const { plan, profile } = planOfRevision(r.spec);
  const rows = storedRows(row.measurements);
  const result = evaluateInspection(plan, rows);
  return {
    id: row.id,
    state: row.state,
    revision: { id: r.id, number: r.number, status: r.status, specSha256: r.specSha256, author: names.get(r.authorId)?.name ?? '(unknown)' },
    plate: { id: plate!.id, partNumber: plate!.partNumber, title: plate!.title, material: plate!.material },
    machinist: { id: row.machinistId, name: names.get(row.machinistId)?.name ?? '(unknown)' },
    acceptedBy: row.acceptedById ? { id: row.acceptedById, name: names.get(row.acceptedById)?.name ?? '(unknown)' } : null,
    acceptComment: row.acceptComment,
    note: row.note,
    artifactHashes: row.artifactHashes as { name: string; sha256: string }[],
    measurements: rows,
    plan,
    result,
    results: result.features.map(resultSummary),
    overall: result.overall,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    completedAt: row.completedAt?.toISOString() ?? null,
    acceptedAt: row.acceptedAt?.toISOString() ?? null,
    /** for the report: the outline and holes in plate coordinates */
    profile,
  };
}

export type InspectionView = Awaited<ReturnType<typeof getInspection>>;

export class RowsRejected extends AppError {
  constructor(errors: readonly RowError[], what: string) {
    const head = errors
      .slice(0, 5)
      .map((e) => `${what === 'CSV' ? 'line' : 'row'} ${e.row}${e.column ? ` (${e.column})` : ''}: ${e.message}`)
      .join('; ');
    super(400, 'invalid_measurements', `${errors.length} problem${errors.length > 1 ? 's' : ''} in the ${what}; nothing was saved. ${head}${errors.length > 5 ? ' …' : ''}`, { rows: errors });
  }
}

export interface SaveOutcome {
  id: number;
  state: InspectionState;
  overall: InspectionResult['overall'];
  results: ReturnType<typeof resultSummary>[];
  result: InspectionResult;
  /** the inspection left in_progress with this save */
  completed: boolean;
}

export async function saveMeasurements(db: Db, user: SessionUser, id: number, rows: MeasurementRow[], opts: { finish?: boolean; source: 'JSON' | 'CSV' }): Promise<SaveOutcome> {
  if (user.role !== 'machinist') throw forbidden(`Measurements are entered by a machinist; you are signed in as ${user.role}.`);
  return db.transaction(async (tx) => {
    const row = await findInspection(tx, id, true);
    if (!row) throw notFound('Inspection');
    if (row.state !== 'in_progress') {
      throw new AppError(409, 'inspection_closed', `This inspection is already ${row.state.replace(/_/g, ' ')}; its measurements are kept as recorded. Start a new inspection to measure again.`);
    }
    const r = (await findRevision(tx, row.revisionId))!;
    const { plan } = planOfRevision(r.spec);
    const problems = rowProblems(plan, rows);
    if (problems.length) throw new RowsRejected(problems, opts.source === 'CSV' ? 'CSV' : 'rows');
    const result = evaluateInspection(plan, rows);
    let state: InspectionState = 'in_progress';
    if (opts.finish) {
      if (result.overall === 'incomplete') {
        const missing = result.features.filter((f) => f.result === 'not_measured').map((f) => f.featureId);
        throw new AppError(409, 'inspection_incomplete', `Not finished: ${missing.length} feature(s) still need values (${missing.slice(0, 8).join(', ')}${missing.length > 8 ? ' …' : ''}). Your values were not saved with this request; save without finishing to keep them.`, { missing });
      }
      state = result.overall;
    }
    await tx
      .update(inspections)
      .set({ measurements: rows, results: result, state, updatedAt: new Date(), ...(state !== 'in_progress' ? { completedAt: new Date() } : {}) })
      .where(eq(inspections.id, id));
    await audit(tx, user.id, 'inspection.measured', { type: 'inspection', id }, { rows: rows.length, overall: result.overall, failing: result.failing, source: opts.source });
    if (state !== 'in_progress') await audit(tx, user.id, `inspection.${state}`, { type: 'inspection', id }, { from: 'in_progress', to: state, failing: result.failing });
    return { id, state, overall: result.overall, results: result.features.map(resultSummary), result, completed: state !== 'in_progress' };
  });
}

export async function acceptInspection(db: Db, user: SessionUser, id: number, comment: string) {
  if (user.role !== 'engineer' && user.role !== 'admin') throw forbidden(`Accepting a deviation needs the role engineer or admin; you are signed in as ${user.role}.`);
  return db.transaction(async (tx) => {
    const row = await findInspection(tx, id, true);
    if (!row) throw notFound('Inspection');
    if (row.state !== 'failed') {
      throw new AppError(409, 'not_failed', `Only a failed inspection can be accepted with deviation; this one is ${row.state.replace(/_/g, ' ')}.`);
    }
    await tx.update(inspections).set({ state: 'accepted_with_deviation', acceptedById: user.id, acceptComment: comment, acceptedAt: new Date(), updatedAt: new Date() }).where(eq(inspections.id, id));
    await audit(tx, user.id, 'inspection.accepted_with_deviation', { type: 'inspection', id }, { from: 'failed', to: 'accepted_with_deviation', comment });
    return { id, state: 'accepted_with_deviation' as const };
  });
}

export async function listPlateInspections(db: Db, user: SessionUser, plateId: number) {
  const plate = SHOP_ROLES.includes(user.role)
    ? (await db.select().from(plates).where(eq(plates.id, plateId)))[0]
    : await assertPlateView(db, user, plateId);
  if (!plate) throw notFound('Plate');
  const rows = await db
    .select({ id: inspections.id, state: inspections.state, revisionId: inspections.revisionId, revision: revisions.number, machinist: users.name, createdAt: inspections.createdAt, completedAt: inspections.completedAt, results: inspections.results })
    .from(inspections)
    .innerJoin(revisions, eq(revisions.id, inspections.revisionId))
    .innerJoin(users, eq(users.id, inspections.machinistId))
    .where(eq(inspections.plateId, plateId))
    .orderBy(desc(inspections.createdAt), desc(inspections.id));
  const [released] = await db.select({ id: revisions.id, number: revisions.number }).from(revisions).where(and(eq(revisions.plateId, plateId), eq(revisions.status, 'approved'))).limit(1);
  return {
    plate: { id: plate.id, partNumber: plate.partNumber, title: plate.title },
    released: released ?? null,
    inspections: rows.map((r) => {
      const res = r.results as InspectionResult | null;
      return { id: r.id, state: r.state, revisionId: r.revisionId, revision: r.revision, machinist: r.machinist, createdAt: r.createdAt.toISOString(), completedAt: r.completedAt?.toISOString() ?? null, failing: res?.failing ?? [] };
    }),
  };
}

/** The revision author, for the report mail. */
export async function revisionAuthor(db: Db, revisionId: number) {
  const [u] = await db.select({ email: users.email, name: users.name, active: users.active }).from(users).innerJoin(revisions, eq(revisions.authorId, users.id)).where(eq(revisions.id, revisionId));
  return u;
}
