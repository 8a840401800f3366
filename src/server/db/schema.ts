import {
  bigint,
  boolean,
  char,
  datetime,
  index,
  int,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  text,
  uniqueIndex,
  varchar,
} from 'drizzle-orm/mysql-core';
import type { AnyMySqlColumn } from 'drizzle-orm/mysql-core';
import { sql } from 'drizzle-orm';
import { jsonDoc, longblob } from './columns';

export const ROLES = ['designer', 'engineer', 'machinist', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const REVISION_STATUSES = ['draft', 'in_review', 'approved', 'changes_requested', 'superseded'] as const;
export type RevisionStatus = (typeof REVISION_STATUSES)[number];

export const REVIEW_DECISIONS = ['submitted', 'approved', 'changes_requested', 'comment'] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];

const createdAt = () => datetime('created_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`);

// Surrogate keys are BIGINT UNSIGNED AUTO_INCREMENT (MariaDB rejects drizzle's `serial AUTO_INCREMENT`).
const pk = () => bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey();
const idRef = (name: string) => bigint(name, { mode: 'number', unsigned: true });

export const users = mysqlTable(
  'users',
  {
    id: varchar('id', { length: 40 }).primaryKey(),
    email: varchar('email', { length: 254 }).notNull(),
    name: varchar('name', { length: 200 }).notNull(),
    role: mysqlEnum('role', ROLES).notNull(),
    active: boolean('active').notNull().default(true),
    passwordHash: varchar('password_hash', { length: 255 }),
    createdAt: createdAt(),
    lastSignInAt: datetime('last_sign_in_at', { mode: 'date', fsp: 3 }),
  },
  (t) => [uniqueIndex('users_email_uq').on(t.email)],
);

/** Sessions: the shape the session library's MySQL adapter expects (id, user_id, expires_at). */
export const sessions = mysqlTable(
  'sessions',
  {
    id: varchar('id', { length: 255 }).primaryKey(),
    userId: varchar('user_id', { length: 40 })
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: datetime('expires_at', { mode: 'date' }).notNull(),
  },
  (t) => [index('sessions_user_idx').on(t.userId)],
);

export const projects = mysqlTable(
  'projects',
  {
    id: pk(),
    name: varchar('name', { length: 200 }).notNull(),
    swapDescription: text('swap_description').notNull(),
    ownerId: varchar('owner_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index('projects_owner_idx').on(t.ownerId)],
);

export const projectMembers = mysqlTable(
  'project_members',
  {
    projectId: idRef('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    userId: varchar('user_id', { length: 40 })
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    addedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.projectId, t.userId] }), index('project_members_user_idx').on(t.userId)],
);

export const plates = mysqlTable(
  'plates',
  {
    id: pk(),
    projectId: idRef('project_id')
      .notNull()
      .references(() => projects.id),
    /** part number, unique in the shop (hence also within its project), e.g. PW-0042 */
    partNumber: varchar('part_number', { length: 32 }).notNull(),
    title: varchar('title', { length: 200 }).notNull(),
    material: varchar('material', { length: 80 }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('plates_part_number_uq').on(t.partNumber), index('plates_project_idx').on(t.projectId)],
);

export const revisions = mysqlTable(
  'revisions',
  {
    id: pk(),
    plateId: idRef('plate_id')
      .notNull()
      .references(() => plates.id),
    /** 1, 2, 3 … per plate */
    number: int('number', { unsigned: true }).notNull(),
    parentRevisionId: idRef('parent_revision_id'),
    status: mysqlEnum('status', REVISION_STATUSES).notNull().default('draft'),
    spec: jsonDoc<unknown>('spec').notNull(),
    specSha256: char('spec_sha256', { length: 64 }).notNull(),
    specSchemaVersion: int('spec_schema_version', { unsigned: true }).notNull(),
    /** check findings at save time */
    checks: jsonDoc<unknown>('checks').notNull(),
    authorId: varchar('author_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    message: text('message').notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('revisions_plate_number_uq').on(t.plateId, t.number),
    index('revisions_status_idx').on(t.status),
    index('revisions_parent_idx').on(t.parentRevisionId),
  ],
);

export const reviews = mysqlTable(
  'reviews',
  {
    id: pk(),
    revisionId: idRef('revision_id')
      .notNull()
      .references(() => revisions.id),
    reviewerId: varchar('reviewer_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    decision: mysqlEnum('decision', REVIEW_DECISIONS).notNull(),
    comment: text('comment').notNull(),
    /** written waivers per check finding: [{ code, featureIds, reason }] */
    waivers: jsonDoc<unknown>('waivers'),
    createdAt: createdAt(),
  },
  (t) => [index('reviews_revision_idx').on(t.revisionId)],
);

export const artifacts = mysqlTable(
  'artifacts',
  {
    id: pk(),
    revisionId: idRef('revision_id')
      .notNull()
      .references(() => revisions.id),
    /** file name, e.g. plate.step, plate.dxf, drawing.pdf */
    kind: varchar('kind', { length: 40 }).notNull(),
    contentType: varchar('content_type', { length: 100 }).notNull(),
    sha256: char('sha256', { length: 64 }).notNull(),
    sizeBytes: int('size_bytes', { unsigned: true }).notNull(),
    bytes: longblob('bytes').notNull(),
    kernelVersion: varchar('kernel_version', { length: 80 }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('artifacts_revision_kind_uq').on(t.revisionId, t.kind)],
);

export const uploads = mysqlTable(
  'uploads',
  {
    id: pk(),
    projectId: idRef('project_id')
      .notNull()
      .references(() => projects.id),
    fileName: varchar('file_name', { length: 255 }).notNull(),
    /** xyz | csv | ply | stl | probe-csv */
    kind: varchar('kind', { length: 20 }).notNull(),
    sizeBytes: bigint('size_bytes', { mode: 'number', unsigned: true }).notNull(),
    sha256: char('sha256', { length: 64 }).notNull(),
    storageKey: varchar('storage_key', { length: 255 }).notNull(),
    /** parsed summary: point count, bounding box, units guess … */
    summary: jsonDoc<unknown>('summary').notNull(),
    uploadedById: varchar('uploaded_by_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index('uploads_project_idx').on(t.projectId), uniqueIndex('uploads_storage_key_uq').on(t.storageKey)],
);

export const auditEvents = mysqlTable(
  'audit_events',
  {
    id: pk(),
    /** null for the system or an anonymous caller */
    actorId: varchar('actor_id', { length: 40 }).references(() => users.id),
    action: varchar('action', { length: 64 }).notNull(),
    targetType: varchar('target_type', { length: 32 }).notNull(),
    targetId: varchar('target_id', { length: 64 }).notNull(),
    details: jsonDoc<unknown>('details').notNull(),
    at: datetime('at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index('audit_target_idx').on(t.targetType, t.targetId), index('audit_actor_idx').on(t.actorId), index('audit_at_idx').on(t.at)],
);

// ── Sign-in, invitations, password resets ─────────────────────────────────────────────────────
// Tokens sent by e-mail are never stored: only their keyed SHA-256 (see src/server/auth/tokens.ts).

/** One-time invitation to join the shop with a role; accepted once, within its expiry. */
export const invitations = mysqlTable(
  'invitations',
  {
    id: pk(),
    email: varchar('email', { length: 254 }).notNull(),
    role: mysqlEnum('role', ROLES).notNull(),
    tokenHash: char('token_hash', { length: 64 }).notNull(),
    invitedById: varchar('invited_by_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
    acceptedAt: datetime('accepted_at', { mode: 'date', fsp: 3 }),
    acceptedUserId: varchar('accepted_user_id', { length: 40 }).references(() => users.id),
    /** set when a newer invitation to the same address replaces this one */
    revokedAt: datetime('revoked_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('invitations_token_hash_uq').on(t.tokenHash), index('invitations_email_idx').on(t.email)],
);

/** One-time password reset link for an existing user. */
export const passwordResetTokens = mysqlTable(
  'password_reset_tokens',
  {
    id: pk(),
    userId: varchar('user_id', { length: 40 })
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    tokenHash: char('token_hash', { length: 64 }).notNull(),
    expiresAt: datetime('expires_at', { mode: 'date', fsp: 3 }).notNull(),
    usedAt: datetime('used_at', { mode: 'date', fsp: 3 }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('password_reset_token_hash_uq').on(t.tokenHash), index('password_reset_user_idx').on(t.userId)],
);

/** Every sign-in attempt by e-mail address, for the failed-attempt limit. Never the password. */
export const signInAttempts = mysqlTable(
  'sign_in_attempts',
  {
    id: pk(),
    /** normalised (trimmed, lower-case) address as typed, known or not */
    email: varchar('email', { length: 254 }).notNull(),
    succeeded: boolean('succeeded').notNull(),
    ip: varchar('ip', { length: 64 }),
    at: datetime('at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index('sign_in_attempts_email_at_idx').on(t.email, t.at)],
);

// ── Quotes, orders and payment ────────────────────────────────────────────────────────────────
// Money is BIGINT minor units (cents) with the currency beside it; never a float.

/** The shop's quoting rates (one row, id 1): a document checked by shopRatesSchema (src/domain/quote). */
export const shopSettings = mysqlTable('shop_settings', {
  id: int('id', { unsigned: true }).primaryKey(),
  rates: jsonDoc<unknown>('rates').notNull(),
  updatedById: varchar('updated_by_id', { length: 40 }).references(() => users.id),
  updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
});

export const QUOTE_STATES = ['open', 'accepted'] as const;
export type QuoteState = (typeof QUOTE_STATES)[number];

export const quotes = mysqlTable(
  'quotes',
  {
    id: pk(),
    revisionId: idRef('revision_id')
      .notNull()
      .references(() => revisions.id),
    /** the revision's spec hash when quoted: the quote is for exactly these bytes */
    specSha256: char('spec_sha256', { length: 64 }).notNull(),
    requestedById: varchar('requested_by_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    quantity: int('quantity', { unsigned: true }).notNull(),
    currency: char('currency', { length: 3 }).notNull(),
    currencyMinorDigits: int('currency_minor_digits', { unsigned: true }).notNull(),
    /** every line with its arithmetic inputs (QuoteLine[]) */
    lines: jsonDoc<unknown>('lines').notNull(),
    /** the rates the quote was made with */
    rates: jsonDoc<unknown>('rates').notNull(),
    perPlateMinor: bigint('per_plate_minor', { mode: 'number' }).notNull(),
    partsMinor: bigint('parts_minor', { mode: 'number' }).notNull(),
    discountMinor: bigint('discount_minor', { mode: 'number' }).notNull(),
    setupMinor: bigint('setup_minor', { mode: 'number' }).notNull(),
    taxMinor: bigint('tax_minor', { mode: 'number' }).notNull(),
    totalMinor: bigint('total_minor', { mode: 'number' }).notNull(),
    validUntil: datetime('valid_until', { mode: 'date', fsp: 3 }).notNull(),
    state: mysqlEnum('state', QUOTE_STATES).notNull().default('open'),
    createdAt: createdAt(),
  },
  (t) => [index('quotes_revision_idx').on(t.revisionId), index('quotes_requested_by_idx').on(t.requestedById)],
);

export const ORDER_STATES = ['awaiting_payment', 'paid', 'in_production', 'inspected', 'shipped'] as const;
export type OrderState = (typeof ORDER_STATES)[number];

export const orders = mysqlTable(
  'orders',
  {
    id: pk(),
    quoteId: idRef('quote_id')
      .notNull()
      .references(() => quotes.id),
    revisionId: idRef('revision_id')
      .notNull()
      .references(() => revisions.id),
    customerId: varchar('customer_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    state: mysqlEnum('state', ORDER_STATES).notNull().default('awaiting_payment'),
    quantity: int('quantity', { unsigned: true }).notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    currency: char('currency', { length: 3 }).notNull(),
    checkoutSessionId: varchar('checkout_session_id', { length: 255 }).notNull(),
    /** the payment service's id of the payment, once paid */
    paymentReference: varchar('payment_reference', { length: 255 }),
    lastPaymentProblem: varchar('last_payment_problem', { length: 500 }),
    paidAt: datetime('paid_at', { mode: 'date', fsp: 3 }),
    shippedAt: datetime('shipped_at', { mode: 'date', fsp: 3 }),
    trackingNote: varchar('tracking_note', { length: 500 }),
    /** the inspection that let the order become `inspected`; one inspection serves one order */
    inspectionId: idRef('inspection_id').references((): AnyMySqlColumn => inspections.id),
    createdAt: createdAt(),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [
    uniqueIndex('orders_quote_uq').on(t.quoteId),
    uniqueIndex('orders_checkout_session_uq').on(t.checkoutSessionId),
    index('orders_customer_idx').on(t.customerId),
    index('orders_state_idx').on(t.state),
    uniqueIndex('orders_inspection_uq').on(t.inspectionId),
  ],
);

/** Every payment event taken in, once (the unique event id makes replays a no-op). */
export const paymentEvents = mysqlTable(
  'payment_events',
  {
    id: pk(),
    eventId: varchar('event_id', { length: 255 }).notNull(),
    type: varchar('type', { length: 100 }).notNull(),
    orderId: idRef('order_id').references(() => orders.id),
    /** what the event did: applied (state changed), ignored (nothing to change), declined … */
    outcome: varchar('outcome', { length: 40 }).notNull(),
    detail: varchar('detail', { length: 500 }).notNull(),
    receivedAt: datetime('received_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [uniqueIndex('payment_events_event_uq').on(t.eventId), index('payment_events_order_idx').on(t.orderId)],
);

// ── Inspection of the machined plate against its released revision ─────────────────────────────

export const INSPECTION_STATES = ['in_progress', 'passed', 'failed', 'accepted_with_deviation'] as const;
export type InspectionState = (typeof INSPECTION_STATES)[number];

/** One as-machined inspection of one part against one approved revision. */
export const inspections = mysqlTable(
  'inspections',
  {
    id: pk(),
    revisionId: idRef('revision_id')
      .notNull()
      .references(() => revisions.id),
    plateId: idRef('plate_id')
      .notNull()
      .references(() => plates.id),
    machinistId: varchar('machinist_id', { length: 40 })
      .notNull()
      .references(() => users.id),
    state: mysqlEnum('state', INSPECTION_STATES).notNull().default('in_progress'),
    /** the spec hash and the stored files' hashes at the start: [{ name, sha256 }] */
    specSha256: char('spec_sha256', { length: 64 }).notNull(),
    artifactHashes: jsonDoc<unknown>('artifact_hashes').notNull(),
    /** measurement rows as entered [{ featureId, x?, y?, z?, diameter?, depth? }] */
    measurements: jsonDoc<unknown>('measurements').notNull(),
    /** computed results at the last save (InspectionResult) */
    results: jsonDoc<unknown>('results'),
    /** the machinist's note (optional) */
    note: text('note'),
    acceptedById: varchar('accepted_by_id', { length: 40 }).references(() => users.id),
    /** the engineer's written reason for accepting with deviation */
    acceptComment: text('accept_comment'),
    createdAt: createdAt(),
    updatedAt: datetime('updated_at', { mode: 'date', fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    completedAt: datetime('completed_at', { mode: 'date', fsp: 3 }),
    acceptedAt: datetime('accepted_at', { mode: 'date', fsp: 3 }),
  },
  (t) => [index('inspections_revision_idx').on(t.revisionId), index('inspections_plate_idx').on(t.plateId), index('inspections_state_idx').on(t.state)],
);
