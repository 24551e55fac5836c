import type { Request, RequestHandler } from 'express';
import { and, eq, sql } from 'drizzle-orm';
import type { Role, StudyRole } from '../../shared/roles.js';
import type { Db } from '../db/client.js';
import { preparedFor } from '../db/prepared.js';
import { studyMembers, studies } from '../db/schema.js';
import { HttpError } from '../http-error.js';

/**
 * Every API route declares who may call it with exactly one `allow(...)` as its first handler; a test
 * walks the router and fails on any route without one. Three kinds:
 *  - public: anyone, signed in or not;
 *  - roles: signed-in users whose account role is listed (omit `roles` for any signed-in user);
 *  - study: signed-in members of the study named by the route whose study role is listed. Admins
 *    pass every study check ("admins manage all").
 * `scope` says what an API token must carry: read routes accept read or write tokens.
 */
export type Policy =
  | { kind: 'public' }
  | { kind: 'roles'; roles?: readonly Role[]; scope: 'read' | 'write' }
  | {
      kind: 'study';
      studyRoles: readonly StudyRole[];
      /** Account roles additionally required (e.g. only supervisors approve). */
      roles?: readonly Role[];
      scope: 'read' | 'write';
      /** How to find the study id from the request; defaults to `req.params.id`. */
      studyOf?: StudyLocator;
    };

export type StudyLocator = (req: Request, db: Db) => number | undefined;

export type PolicyHandler = RequestHandler & { policy: Policy };

declare global {
  namespace Express {
    interface User {
      id: number;
      email: string;
      name: string;
      role: Role;
      active: boolean;
    }
    interface Request {
      /** Set when the caller authenticated with a personal access token. */
      authViaToken?: { tokenId: number; scope: 'read' | 'write' };
      /** Set by a study policy: the study and the caller's role in it ('admin' for admins). */
      study?: { id: number; role: StudyRole | 'admin' };
      cookies?: Record<string, string>;
    }
  }
}

// Run on every study route: prepared once per database.
const studyExists = preparedFor((db) => db.select({ id: studies.id }).from(studies).where(eq(studies.id, sql.placeholder('studyId'))).prepare());
const memberRole = preparedFor((db) =>
  db
    .select({ role: studyMembers.role })
    .from(studyMembers)
    .where(and(eq(studyMembers.studyId, sql.placeholder('studyId')), eq(studyMembers.userId, sql.placeholder('userId'))))
    .prepare(),
);

export const ALL_STUDY_ROLES: readonly StudyRole[] = ['owner', 'contributor', 'reviewer', 'viewer'];
export const EDITOR_ROLES: readonly StudyRole[] = ['owner', 'contributor'];

export function publicRoute(): PolicyHandler {
  const h: RequestHandler = (_req, _res, next) => next();
  return Object.assign(h, { policy: { kind: 'public' } as const });
}

export function signedIn(opts: { roles?: readonly Role[]; scope?: 'read' | 'write' } = {}): PolicyHandler {
  const policy: Policy = { kind: 'roles', roles: opts.roles, scope: opts.scope ?? 'read' };
  const h: RequestHandler = (req, _res, next) => {
    requireUser(req, policy.scope);
    if (policy.roles && !policy.roles.includes(req.user!.role)) {
      throw new HttpError(403, `This needs the ${policy.roles.join(' or ')} role; you are signed in as ${req.user!.role}`);
    }
    next();
  };
  return Object.assign(h, { policy });
}

export function studyMember(
  db: () => Db,
  opts: { studyRoles: readonly StudyRole[]; roles?: readonly Role[]; scope?: 'read' | 'write'; studyOf?: StudyLocator },
): PolicyHandler {
  const policy: Policy = { kind: 'study', studyRoles: opts.studyRoles, roles: opts.roles, scope: opts.scope ?? 'read', studyOf: opts.studyOf };
  const h: RequestHandler = (req, _res, next) => {
    requireUser(req, policy.scope);
    const user = req.user!;
    const database = db();
    const studyId = (opts.studyOf ?? paramStudyId)(req, database);
    if (studyId === undefined) throw new HttpError(404, 'The study was not found');
    const study = studyExists(database).get({ studyId });
    if (!study) throw new HttpError(404, 'The study was not found');
    if (user.role === 'admin') {
      req.study = { id: studyId, role: 'admin' };
      return next();
    }
    const member = memberRole(database).get({ studyId, userId: user.id });
    // Non-members get 404, not 403: the existence of a study is itself not disclosed.
    if (!member) throw new HttpError(404, 'The study was not found');
    if (!opts.studyRoles.includes(member.role)) {
      throw new HttpError(403, `This needs the study role ${opts.studyRoles.join(' or ')}; you are ${member.role} in this study`);
    }
    if (opts.roles && !opts.roles.includes(user.role)) {
      throw new HttpError(403, `This needs the ${opts.roles.join(' or ')} role; you are signed in as ${user.role}`);
    }
    req.study = { id: studyId, role: member.role };
    next();
  };
  return Object.assign(h, { policy });
}

function requireUser(req: Request, scope: 'read' | 'write'): void {
  if (!req.user) throw new HttpError(401, 'Sign in to continue');
  if (req.authViaToken && scope === 'write' && req.authViaToken.scope !== 'write') {
    throw new HttpError(403, 'This API token is read-only; this call needs a token with write scope');
  }
}

export const paramStudyId: StudyLocator = (req) => {
  const raw = req.params['id'];
  const id = Number(raw);
  return Number.isInteger(id) && id > 0 ? id : undefined;
};
