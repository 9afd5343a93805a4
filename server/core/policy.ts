import type { NextFunction, Request, Response } from 'express';
import { capabilities, type Capability } from '@shared/api/capabilities';
import type { Role } from '@shared/api/roles';
import { forbidden, notFound, unauthenticated } from './errors';

/** The signed-in user a request acts as. */
export interface Actor {
  userId: number;
  email: string;
  name: string;
  role: Role;
  /** The schools a director or viewer is assigned to; empty for district-wide roles. */
  schoolIds: number[];
  /** A student account's own roster row. */
  studentId: number | null;
  via: 'session' | 'token';
}

export type { Capability };

const capabilitiesByRole: Record<Role, readonly Capability[]> = {
  // The district music coordinator may do everything but what only a student's own account does.
  coordinator: capabilities.filter(
    (capability) => capability !== 'self:read' && capability !== 'takes:own',
  ),
  director: [
    'schools:read',
    'roster:read',
    'roster:write',
    'ladder:read',
    'pass-offs:read',
    'pass-offs:write',
    'fleet:read',
    'loans:read',
    'loans:write',
    'loans:return',
    'loans:see-waivers',
    'counts:run',
    'reports:read',
    'outbox:read',
    'tokens:own',
    'practice:read',
    'takes:hear',
  ],
  technician: [
    'schools:read',
    'ladder:read',
    'fleet:read',
    'fleet:write',
    'loans:read',
    'loans:return',
    'repairs:write',
    'counts:run',
    'tokens:own',
    'practice:read',
  ],
  viewer: [
    'schools:read',
    'roster:read',
    'ladder:read',
    'pass-offs:read',
    'fleet:read',
    'loans:read',
    'reports:read',
    'practice:read',
  ],
  student: ['ladder:read', 'practice:read', 'self:read', 'takes:own'],
};

/** Whether the actor's role grants the capability. */
export function can(actor: Actor, capability: Capability): boolean {
  return capabilitiesByRole[actor.role].includes(capability);
}

/** Every capability of a role, for `/api/me` and the client's navigation. */
export function capabilitiesOf(role: Role): Capability[] {
  return [...capabilitiesByRole[role]];
}

/**
 * Whether the actor sees every school. Coordinators see the district; technicians see the
 * whole fleet (and the schools it lives in); directors and viewers see their assigned schools.
 */
export function seesAllSchools(actor: Actor): boolean {
  return actor.role === 'coordinator' || actor.role === 'technician';
}

/** The schools whose rows the actor may read: 'all', or a list (possibly empty). */
export function schoolScope(actor: Actor): 'all' | number[] {
  return seesAllSchools(actor) ? 'all' : actor.schoolIds;
}

/** Whether a row of this school is visible to the actor. */
export function inScope(actor: Actor, schoolId: number | null | undefined): boolean {
  if (seesAllSchools(actor)) return true;
  return schoolId !== null && schoolId !== undefined && actor.schoolIds.includes(schoolId);
}

/** Throws 404 when a row of this school is outside the actor's schools. */
export function assertInScope(actor: Actor, schoolId: number | null | undefined, what?: string) {
  if (!inScope(actor, schoolId)) throw notFound(what);
}

/** The request's actor; throws 401 when nobody is signed in. */
export function actorOf(request: Request): Actor {
  if (!request.actor) throw unauthenticated();
  return request.actor;
}

/** Middleware: the route needs a signed-in actor with this capability. */
export function requires(capability: Capability) {
  return (request: Request, _response: Response, next: NextFunction) => {
    const actor = actorOf(request);
    if (!can(actor, capability)) throw forbidden();
    next();
  };
}

/** Middleware: the route needs a signed-in actor with any one of these capabilities. */
export function requiresAny(...capabilities: Capability[]) {
  return (request: Request, _response: Response, next: NextFunction) => {
    const actor = actorOf(request);
    if (!capabilities.some((capability) => can(actor, capability))) throw forbidden();
    next();
  };
}

declare module 'express-serve-static-core' {
  interface Request {
    actor?: Actor;
  }
}
