/** Product-wide roles of a user account. */
export const ROLES = ['admin', 'engineer', 'statistician', 'supervisor'] as const;
export type Role = (typeof ROLES)[number];

/** Roles a member can hold within one study, strongest first. */
export const STUDY_ROLES = ['owner', 'contributor', 'reviewer', 'viewer'] as const;
export type StudyRole = (typeof STUDY_ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Research engineer',
  statistician: 'Statistician',
  supervisor: 'Supervisor',
};
