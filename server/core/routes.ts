import { Router, type Request, type RequestHandler } from 'express';
import type { z } from 'zod';
import type { Database } from '../db/client';
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

/** What a record's routes call: each gets the database and the signed-in actor first. */
export interface RecordService<Input, Patch> {
  list?: (db: Database, actor: Actor, query: unknown) => Promise<unknown>;
  get?: (db: Database, actor: Actor, id: number) => Promise<unknown>;
  create?: (db: Database, actor: Actor, input: Input) => Promise<unknown>;
  update?: (db: Database, actor: Actor, id: number, patch: Patch) => Promise<unknown>;
  remove?: (db: Database, actor: Actor, id: number) => Promise<unknown>;
}

/** Where a record's routes live, who may use them, and how its bodies are checked. */
export interface RecordRoutesOptions<InputSchema extends z.ZodType, PatchSchema extends z.ZodType> {
  /** The collection's path, `/schools`; a record is `/schools/:id`. */
  path: string;
  /** Reading, then writing. */
  capabilities: readonly [Capability, Capability];
  /** The create body's schema and its name in a 400's message ("The school has a problem: …"). */
  input?: readonly [InputSchema, string];
  /** The PATCH body's schema (its 400 names it "The change"). */
  patch?: PatchSchema;
}

/**
 * The routes of a record with the usual five calls, each present when the service has it:
 * `GET path` (200, the list), `GET path/:id` (200), `POST path` (201, the new record),
 * `PATCH path/:id` (200, the changed record) and `DELETE path/:id` (204).
 */
export function recordRoutes<InputSchema extends z.ZodType, PatchSchema extends z.ZodType>(
  db: Database,
  options: RecordRoutesOptions<InputSchema, PatchSchema>,
  service: RecordService<z.infer<InputSchema>, z.infer<PatchSchema>>,
  router = Router(),
): Router {
  const { path, capabilities, input, patch } = options;
  const read = requires(capabilities[0]);
  const write = requires(capabilities[1]);
  const { list, get, create, update, remove } = service;
  if (list)
    router.get(
      path,
      read,
      answer((request, actor) => list(db, actor, request.query)),
    );
  if (get)
    router.get(
      `${path}/:id`,
      read,
      answer((request, actor) => get(db, actor, idOf(request))),
    );
  if (create && input) {
    const [schema, what] = input;
    router.post(
      path,
      write,
      created((request, actor) => create(db, actor, parseInput(schema, request.body, what))),
    );
  }
  if (update && patch)
    router.patch(
      `${path}/:id`,
      write,
      answer((request, actor) =>
        update(db, actor, idOf(request), parseInput(patch, request.body, 'The change')),
      ),
    );
  if (remove)
    router.delete(
      `${path}/:id`,
      write,
      noContent((request, actor) => remove(db, actor, idOf(request))),
    );
  return router;
}
