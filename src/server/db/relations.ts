import { relations } from 'drizzle-orm';
import {
  artifacts,
  auditEvents,
  invitations,
  inspections,
  orders,
  paymentEvents,
  quotes,
  shopSettings,
  passwordResetTokens,
  plates,
  projectMembers,
  projects,
  reviews,
  revisions,
  sessions,
  uploads,
  users,
} from './schema';

// Relations for typing and documentation. On MariaDB 10.11 query with the core builder and joins:
// the relational query API needs LATERAL joins that MariaDB lacks.

export const usersRelations = relations(users, ({ many }) => ({
  sessions: many(sessions),
  ownedProjects: many(projects),
  memberships: many(projectMembers),
  revisions: many(revisions),
  reviews: many(reviews),
}));

export const sessionsRelations = relations(sessions, ({ one }) => ({
  user: one(users, { fields: [sessions.userId], references: [users.id] }),
}));

export const projectsRelations = relations(projects, ({ one, many }) => ({
  owner: one(users, { fields: [projects.ownerId], references: [users.id] }),
  members: many(projectMembers),
  plates: many(plates),
  uploads: many(uploads),
}));

export const projectMembersRelations = relations(projectMembers, ({ one }) => ({
  project: one(projects, { fields: [projectMembers.projectId], references: [projects.id] }),
  user: one(users, { fields: [projectMembers.userId], references: [users.id] }),
}));

export const platesRelations = relations(plates, ({ one, many }) => ({
  project: one(projects, { fields: [plates.projectId], references: [projects.id] }),
  revisions: many(revisions),
}));

export const revisionsRelations = relations(revisions, ({ one, many }) => ({
  plate: one(plates, { fields: [revisions.plateId], references: [plates.id] }),
  parent: one(revisions, { fields: [revisions.parentRevisionId], references: [revisions.id], relationName: 'parent' }),
  author: one(users, { fields: [revisions.authorId], references: [users.id] }),
  reviews: many(reviews),
  artifacts: many(artifacts),
}));

export const reviewsRelations = relations(reviews, ({ one }) => ({
  revision: one(revisions, { fields: [reviews.revisionId], references: [revisions.id] }),
  reviewer: one(users, { fields: [reviews.reviewerId], references: [users.id] }),
}));

export const artifactsRelations = relations(artifacts, ({ one }) => ({
  revision: one(revisions, { fields: [artifacts.revisionId], references: [revisions.id] }),
}));

export const uploadsRelations = relations(uploads, ({ one }) => ({
  project: one(projects, { fields: [uploads.projectId], references: [projects.id] }),
  uploadedBy: one(users, { fields: [uploads.uploadedById], references: [users.id] }),
}));

export const auditEventsRelations = relations(auditEvents, ({ one }) => ({
  actor: one(users, { fields: [auditEvents.actorId], references: [users.id] }),
}));

export const invitationsRelations = relations(invitations, ({ one }) => ({
  invitedBy: one(users, { fields: [invitations.invitedById], references: [users.id], relationName: 'invitedBy' }),
  acceptedUser: one(users, { fields: [invitations.acceptedUserId], references: [users.id], relationName: 'acceptedUser' }),
}));

export const passwordResetTokensRelations = relations(passwordResetTokens, ({ one }) => ({
  user: one(users, { fields: [passwordResetTokens.userId], references: [users.id] }),
}));

export const quotesRelations = relations(quotes, ({ one, many }) => ({
  revision: one(revisions, { fields: [quotes.revisionId], references: [revisions.id] }),
  requestedBy: one(users, { fields: [quotes.requestedById], references: [users.id] }),
  orders: many(orders),
}));

export const ordersRelations = relations(orders, ({ one, many }) => ({
  quote: one(quotes, { fields: [orders.quoteId], references: [quotes.id] }),
  revision: one(revisions, { fields: [orders.revisionId], references: [revisions.id] }),
  customer: one(users, { fields: [orders.customerId], references: [users.id] }),
  paymentEvents: many(paymentEvents),
}));

export const paymentEventsRelations = relations(paymentEvents, ({ one }) => ({
  order: one(orders, { fields: [paymentEvents.orderId], references: [orders.id] }),
}));

export const shopSettingsRelations = relations(shopSettings, ({ one }) => ({
  updatedBy: one(users, { fields: [shopSettings.updatedById], references: [users.id] }),
}));

export const inspectionsRelations = relations(inspections, ({ one }) => ({
  revision: one(revisions, { fields: [inspections.revisionId], references: [revisions.id] }),
  plate: one(plates, { fields: [inspections.plateId], references: [plates.id] }),
  machinist: one(users, { fields: [inspections.machinistId], references: [users.id] }),
}));
