import type { Role } from '../db/schema';

/** What each role does in the shop, in one line (e-mails, the users page, the 403 page). */
export const ROLE_DUTY: Record<Role, string> = {
  designer: 'drafts adapter plates from the measured flanges and submits revisions for review',
  engineer: 'reviews every check and approves a revision or sends it back with changes',
  machinist: 'sees released revisions only, downloads DXF, STEP and the drawing, and records the inspection',
  admin: 'invites people and sets roles, and can do everything an engineer can',
};

export const ROLE_LABEL: Record<Role, string> = {
  designer: 'designer',
  engineer: 'engineer',
  machinist: 'machinist',
  admin: 'admin',
};
