import { Router, type Request, type RequestHandler } from 'express';
import type { z } from 'zod';
import type { Database } from '../db/client';
import type { Services } from '../services';
import { actorOf, requires, type Actor, type Capability } from './policy';
import { parseId, parseInput } from './validate';

/** What a route does with the request and its signed-in actor; its result is the answer. */
export type RouteWork = (request: Request, actor: Actor) => Promise<unknown>;

/**
 * A handler that runs the work and answers its result as JSON with `status` (200 unless given);
 * 204 answers no body. A thrown `HttpError` reaches the error handler as Express 5 passes on a
 * rejected promise ("Error handling", expressjs.com).
 */
export function answer(work: RouteWork, status = 200): RequestHandler {
  return async (request, response) => {
    const result = await work(request, actorOf(request));
    if (status === 204) response.status(204).end();
    else response.status(status).json(result);
  };
}

/** `answer(work, 201)`: a record was created. */
export const created = (work: RouteWork): RequestHandler => answer(work, 201);

/** `answer(work, 204)`: done, nothing to send back. */
export const noContent = (work: RouteWork): RequestHandler => answer(work, 204);

/** The numeric `:id` (or another named parameter) of the route. */
export const idOf = (request: Request, name = 'id'): number => parseId(request.params[name]);

type Work<Args extends unknown[]> = (db: Database, actor: Actor, ...args: Args) => Promise<unknown>;

/**
 * A record's usual calls, each with the capability it needs: reading (the list and one record),
 * creating (with the body's schema and its name in a 400's message, "The school has a problem:
 * …"), changing (the PATCH body's schema; its 400 names it "The change") and removing. Every
 * service call gets the database and the signed-in actor first.
 */
export interface RecordCalls<InputSchema extends z.ZodType, PatchSchema extends z.ZodType> {
  read?: readonly [Capability, list?: Work<[query: unknown]>, get?: Work<[id: number]>];
  create?: readonly [Capability, InputSchema, string, Work<[input: z.infer<InputSchema>]>];
  update?: readonly [Capability, PatchSchema, Work<[id: number, patch: z.infer<PatchSchema>]>];
  remove?: readonly [Capability, Work<[id: number]>];
  /** `POST path/:id/<name>`: an action on one record (200, what the action answers). */
  actions?: Record<string, readonly [Capability, Work<[id: number]>]>;
}

/** A district-wide call that does not depend on who asks, as a record's call (the route's capability still applies). */
export const withoutActor =
  <Args extends unknown[]>(work: (db: Database, ...args: Args) => Promise<unknown>): Work<Args> =>
  (db, _actor, ...args) =>
    work(db, ...args);

/**
 * The routes of a record under `path`, each present when given: `GET path` (200, the list),
 * `GET path/:id` (200), `POST path` (201, the new record), `PATCH path/:id` (200, the changed
 * record) and `DELETE path/:id` (204). Mounted on `router` when one is given (where routes
 * registered before them must match first), else on a new one.
 */
export function recordRoutes<InputSchema extends z.ZodType, PatchSchema extends z.ZodType>(
  path: string,
  calls: RecordCalls<InputSchema, PatchSchema>,
): (services: Services, router?: Router) => Router {
  return ({ db }, router = Router()) => {
    const { read, create, update, remove, actions = {} } = calls;
    const [readCapability, list, get] = read ?? [];
    if (readCapability && list)
      router.get(
        path,
        requires(readCapability),
        answer((request, actor) => list(db, actor, request.query)),
      );
    if (readCapability && get)
      router.get(
        `${path}/:id`,
        requires(readCapability),
        answer((request, actor) => get(db, actor, idOf(request))),
      );
    if (create) {
      const [capability, schema, what, work] = create;
      router.post(
        path,
        requires(capability),
        created((request, actor) => work(db, actor, parseInput(schema, request.body, what))),
      );
    }
    if (update) {
      const [capability, schema, work] = update;
      router.patch(
        `${path}/:id`,
        requires(capability),
        answer((request, actor) =>
          work(db, actor, idOf(request), parseInput(schema, request.body, 'The change')),
        ),
      );
    }
    if (remove) {
      const [capability, work] = remove;
      router.delete(
        `${path}/:id`,
        requires(capability),
        noContent((request, actor) => work(db, actor, idOf(request))),
      );
    }
    for (const [name, [capability, work]] of Object.entries(actions))
      router.post(
        `${path}/:id/${name}`,
        requires(capability),
        answer((request, actor) => work(db, actor, idOf(request))),
      );
    return router;
  };
}
