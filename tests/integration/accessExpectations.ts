/**
 * Who may call what: one expected HTTP status per route × method × caller. The access-matrix
 * test builds the route list from the files under src/pages and FAILS for any route that has no
 * entry here (and for entries whose route is gone), so a new endpoint cannot go untested.
 *
 * Callers: anonymous; member = a designer who owns the fixture project; outsider = a designer
 * with a project of their own, not a member of the fixture's; engineer; machinist; admin.
 * Ids in paths are the member's objects, so the outsider rows are the object-level checks.
 * 404 (not 403) for objects the caller may not see: nothing leaks about what exists.
 */

export const CALLERS = ['anonymous', 'member', 'outsider', 'engineer', 'machinist', 'admin'] as const;
export type Caller = (typeof CALLERS)[number];
export type Status = number | readonly number[];

export interface Fixtures {
  /** the member's project, its plate (rev 1 approved with files, rev 2 draft), an upload */
  projectId: number;
  plateId: number;
  approvedRevisionId: number;
  draftRevisionId: number;
  uploadId: number;
  /** a user the admin may change harmlessly */
  targetUserId: string;
  emails: Record<Exclude<Caller, 'anonymous'>, string>;
  password: string;
  demoSpec: unknown;
  /** new objects for routes that change state, made by the member (and submitted for review) */
  freshPlate(): Promise<number>;
  freshDraft(): Promise<number>;
  freshInReview(): Promise<number>;
  uploadForm(): FormData;
  /** a quote on the approved revision, requested by the member */
  freshQuote(): Promise<number>;
  /** the shop's current rates (sent back unchanged by the PATCH row) */
  shopRates(): Promise<unknown>;
}

export interface Req {
  path: string;
  body?: unknown;
  form?: FormData;
}

export interface Expectation {
  expect: Record<Caller, Status>;
  /** the request; default: the route with its ids filled from the fixtures, body {} */
  request?: (fx: Fixtures, caller: Caller) => Req | Promise<Req>;
  /** run on a throwaway session of the caller (routes that end or replace the session) */
  ownSession?: boolean;
  /** changes state: also sent cross-site by the CSRF test (default: every method but GET) */
  why?: string;
}

const all = (s: Status): Record<Caller, Status> => ({ anonymous: s, member: s, outsider: s, engineer: s, machinist: s, admin: s });
const signedIn = (s: Status): Record<Caller, Status> => ({ ...all(s), anonymous: 401 });
const roles = (ok: Status, allowed: Caller[], outsider: Status = ok): Record<Caller, Status> => {
  const r = { ...all(403), anonymous: 401 } as Record<Caller, Status>;
  for (const c of allowed) r[c] = c === 'outsider' ? outsider : ok;
  return r;
};
/** designers of the project, engineers and admins; the outsider sees 404 */
const projectEditors = (ok: Status): Record<Caller, Status> => ({ anonymous: 401, member: ok, outsider: 404, engineer: ok, machinist: 403, admin: ok });

const bogusToken = 'no-such-token-0123456789abcdef0123456789abcdef';

export const API_EXPECTATIONS: Record<string, Expectation> = {
  'GET /api/health': { expect: all(200) },
  'GET /api/me': { expect: signedIn(200) },
  'PATCH /api/account': { expect: signedIn(200), request: (_fx, c) => ({ path: '/api/account', body: { name: `Renamed ${c}` } }) },
  'POST /api/account/password': {
    // a wrong current password: the rule is reached without changing anything
    expect: { ...signedIn([400, 401, 403]) },
    request: () => ({ path: '/api/account/password', body: { currentPassword: 'not-the-password', newPassword: 'another long password 42' } }),
  },
  'POST /api/auth/sign-in': {
    ownSession: true,
    expect: { ...all(200), anonymous: 401 },
    request: (fx, c) => ({ path: '/api/auth/sign-in', body: c === 'anonymous' ? { email: 'nobody@example.test', password: 'wrong password here' } : { email: fx.emails[c], password: fx.password } }),
  },
  'POST /api/auth/sign-out': { ownSession: true, expect: all(204) },
  'POST /api/auth/password-reset': { expect: all([200, 202]), request: () => ({ path: '/api/auth/password-reset', body: { email: 'nobody@example.test' } }) },
  'POST /api/auth/password-reset/:token': { expect: all([400, 404, 410]), request: () => ({ path: `/api/auth/password-reset/${bogusToken}`, body: { password: 'a brand new password 42' } }) },
  'GET /api/invites/:token': { expect: all([404, 410]), request: () => ({ path: `/api/invites/${bogusToken}` }) },
  'POST /api/invites/:token': { expect: all([404, 410]), request: () => ({ path: `/api/invites/${bogusToken}`, body: { name: 'Nobody', password: 'a brand new password 42' } }) },

  'GET /api/admin/users': { expect: roles(200, ['admin']) },
  'PATCH /api/admin/users/:id': { expect: roles(200, ['admin']), request: (fx) => ({ path: `/api/admin/users/${fx.targetUserId}`, body: { active: true } }) },
  'GET /api/admin/invites': { expect: roles(200, ['admin']) },
  'POST /api/admin/invites': { expect: roles(201, ['admin']), request: (_fx, c) => ({ path: '/api/admin/invites', body: { email: `invited-${c}-${Date.now()}@example.test`, role: 'designer' } }) },
  'GET /api/admin/mail': { expect: roles(200, ['admin']) },

  'GET /api/projects': { expect: roles(200, ['member', 'outsider', 'engineer', 'admin']) },
  'POST /api/projects': { expect: roles(201, ['member', 'outsider', 'engineer', 'admin']), request: (_fx, c) => ({ path: '/api/projects', body: { name: `Matrix project ${c}`, swapDescription: 'invented swap' } }) },
  'GET /api/projects/:id': { expect: projectEditors(200) },
  'PATCH /api/projects/:id': { expect: projectEditors(200), request: (fx) => ({ path: `/api/projects/${fx.projectId}`, body: { swapDescription: 'invented swap, renamed' } }) },
  'POST /api/projects/:id/members': {
    // adding someone already a member is answered as a success or a conflict, never more
    expect: projectEditors([200, 201, 409]),
    request: (fx) => ({ path: `/api/projects/${fx.projectId}/members`, body: { email: fx.emails.engineer } }),
  },
  'GET /api/projects/:id/plates': { expect: projectEditors(200) },
  'POST /api/projects/:id/plates': { expect: projectEditors(201), request: (fx, c) => ({ path: `/api/projects/${fx.projectId}/plates`, body: { title: `Matrix plate ${c}`, material: '6061-T6 aluminium' } }) },
  'GET /api/projects/:id/uploads': { expect: { ...projectEditors(200), machinist: [403, 404] } },
  'POST /api/projects/:id/uploads': { expect: projectEditors(201), request: (fx) => ({ path: `/api/projects/${fx.projectId}/uploads`, form: fx.uploadForm() }) },

  'GET /api/plates/:id': { expect: { ...projectEditors(200), machinist: 200 }, why: 'machinists see plates that have a released revision' },
  'GET /api/plates/:id/revisions': { expect: { ...projectEditors(200), machinist: 200 } },
  'POST /api/plates/:id/revisions': {
    expect: projectEditors(201),
    request: async (fx) => ({ path: `/api/plates/${await fx.freshPlate()}/revisions`, body: { spec: fx.demoSpec, message: 'matrix save', parentRevisionId: null } }),
  },
  'POST /api/plates/:id/preview/drawing.pdf': { expect: projectEditors(200), request: (fx) => ({ path: `/api/plates/${fx.plateId}/preview/drawing.pdf`, body: { spec: fx.demoSpec } }) },

  'GET /api/revisions/:id': { expect: { ...projectEditors(200), machinist: 404 }, why: 'the draft: machinists see approved revisions only' },
  'GET /api/revisions/:a/compare/:b': {
    expect: { ...projectEditors(200), machinist: 404 },
    request: (fx) => ({ path: `/api/revisions/${fx.approvedRevisionId}/compare/${fx.draftRevisionId}` }),
  },
  'GET /api/revisions/:id/files/:name': {
    expect: { ...projectEditors(200), machinist: 200 },
    request: (fx) => ({ path: `/api/revisions/${fx.approvedRevisionId}/files/plate.dxf` }),
  },
  'POST /api/revisions/:id/submit': { expect: projectEditors(200), request: async (fx) => ({ path: `/api/revisions/${await fx.freshDraft()}/submit`, body: {} }) },
  'POST /api/revisions/:id/approve': {
    expect: { ...roles(200, ['engineer', 'admin']) },
    request: async (fx) => ({ path: `/api/revisions/${await fx.freshInReview()}/approve`, body: { comment: 'matrix approval' } }),
  },
  'POST /api/revisions/:id/request-changes': {
    expect: { ...roles(200, ['engineer', 'admin']) },
    request: async (fx) => ({ path: `/api/revisions/${await fx.freshInReview()}/request-changes`, body: { comment: 'matrix: please change' } }),
  },
  'GET /api/review-queue': { expect: roles(200, ['engineer', 'admin']) },
  'GET /api/releases': { expect: roles(200, ['machinist', 'engineer', 'admin']) },

  // quotes and orders
  'GET /api/admin/shop-settings': { expect: roles(200, ['admin']) },
  'PATCH /api/admin/shop-settings': { expect: roles(200, ['admin']), request: async (fx) => ({ path: '/api/admin/shop-settings', body: await fx.shopRates() }) },
  'GET /api/revisions/:id/quotes': { expect: { ...projectEditors(200), machinist: 403 }, request: (fx) => ({ path: `/api/revisions/${fx.approvedRevisionId}/quotes` }) },
  'POST /api/revisions/:id/quotes': { expect: { ...projectEditors(201), machinist: 403 }, request: (fx) => ({ path: `/api/revisions/${fx.approvedRevisionId}/quotes`, body: { quantity: 2 } }) },
  'GET /api/quotes/:id': { expect: { ...projectEditors(200), machinist: 403 }, request: async (fx) => ({ path: `/api/quotes/${await fx.freshQuote()}` }) },
  'POST /api/quotes/:id/accept': {
    // an id that does not exist: the role rule and the 404 (accepting starts a real checkout)
    expect: { anonymous: 401, member: 404, outsider: 404, engineer: 404, machinist: 403, admin: 404 },
    request: () => ({ path: '/api/quotes/999999999/accept', body: {} }),
  },
  'GET /api/orders': { expect: signedIn(200), why: 'designers see their own orders, the shop sees all' },
  'GET /api/orders/:id': { expect: { ...signedIn(404) }, request: () => ({ path: '/api/orders/999999999' }) },
  'PATCH /api/orders/:id': {
    expect: { anonymous: 401, member: 403, outsider: 403, engineer: 404, machinist: 404, admin: 404 },
    request: () => ({ path: '/api/orders/999999999', body: { state: 'in_production' } }),
  },
  'POST /api/payments/webhook': { expect: all(400), why: 'no caller is trusted: only a valid payment-service signature is', request: () => ({ path: '/api/payments/webhook', body: { type: 'checkout.session.completed' } }) },

  // inspections (ids that do not exist where no fixture inspection is at hand: the role rule, then 404)
  'POST /api/revisions/:id/inspections': { expect: roles(201, ['machinist']), request: (fx) => ({ path: `/api/revisions/${fx.approvedRevisionId}/inspections`, body: {} }) },
  'GET /api/plates/:id/inspections': { expect: { ...projectEditors(200), machinist: 200 } },
  'GET /api/inspections/:id': { expect: signedIn(404), request: () => ({ path: '/api/inspections/999999999' }) },
  'GET /api/inspections/:id/report.pdf': { expect: signedIn(404), request: () => ({ path: '/api/inspections/999999999/report.pdf' }) },
  'PUT /api/inspections/:id/measurements': { expect: roles(404, ['machinist']), request: () => ({ path: '/api/inspections/999999999/measurements', body: { rows: [] } }) },
  'POST /api/inspections/:id/accept': { expect: roles(404, ['engineer', 'admin']), request: () => ({ path: '/api/inspections/999999999/accept', body: { comment: 'matrix: accepted' } }) },

  'GET /api/uploads/:id': { expect: { ...projectEditors(200), machinist: [403, 404] } },
  'GET /api/uploads/:id/file': { expect: { ...projectEditors(200), machinist: [403, 404] } },
  'POST /api/uploads/:id/fit': { expect: { ...projectEditors(200), machinist: [403, 404] }, request: (fx) => ({ path: `/api/uploads/${fx.uploadId}/fit`, body: { kind: 'plane' } }) },
};

/** Pages: anonymous → 302 to sign-in; a role that may not → 302 to /forbidden; objects not visible → 404. */
const pageRoles = (allowed: Caller[], outsider: Status = 200): Record<Caller, Status> => {
  const r = { ...all(302) } as Record<Caller, Status>;
  for (const c of allowed) r[c] = c === 'outsider' ? outsider : 200;
  return r;
};
export const PAGE_EXPECTATIONS: Record<string, Expectation> = {
  'GET /': { expect: all([200, 302]) },
  'GET /sign-in': { expect: all([200, 302]) },
  'GET /forbidden': { expect: all(403), why: 'the page that explains a refusal answers 403 itself' },
  'GET /kernel': { expect: all(200) },
  'GET /reset-password': { expect: all(200) },
  'GET /reset-password/:token': { expect: all([200, 404, 410]), request: () => ({ path: `/reset-password/${bogusToken}` }) },
  'GET /invite/:token': { expect: all([200, 404, 410]), request: () => ({ path: `/invite/${bogusToken}` }) },
  'GET /account': { expect: pageRoles(['member', 'outsider', 'engineer', 'machinist', 'admin']) },
  'GET /admin/users': { expect: pageRoles(['admin']) },
  'GET /admin/mail': { expect: pageRoles(['admin']) },
  'GET /projects': { expect: pageRoles(['member', 'outsider', 'engineer', 'admin']) },
  'GET /projects/:id': { expect: pageRoles(['member', 'outsider', 'engineer', 'admin'], 404) },
  'GET /projects/:id/measurements': { expect: pageRoles(['member', 'outsider', 'engineer', 'admin'], 404) },
  'GET /plates/:id': { expect: pageRoles(['member', 'outsider', 'engineer', 'machinist', 'admin'], 404) },
  'GET /plates/:id/edit': { expect: pageRoles(['member', 'outsider', 'engineer', 'admin'], 404) },
  'GET /review': { expect: pageRoles(['engineer', 'admin']) },
  'GET /shop': { expect: pageRoles(['machinist', 'engineer', 'admin']) },
  'GET /shop/orders': { expect: pageRoles(['machinist', 'engineer', 'admin']) },
  'GET /orders': { expect: pageRoles(['member', 'outsider', 'engineer', 'admin']) },
  'GET /admin/shop': { expect: pageRoles(['admin']) },
  'GET /shop/inspections': { expect: pageRoles(['member', 'outsider', 'engineer', 'machinist', 'admin']), request: (fx) => ({ path: `/shop/inspections?plate=${fx.plateId}` }) },
  'GET /shop/inspections/:id': { expect: { ...all(404), anonymous: 302 }, request: () => ({ path: '/shop/inspections/999999999' }) },
  'GET /sign-out': { expect: all(302) },
  'POST /sign-out': { ownSession: true, expect: all(303) },
};
