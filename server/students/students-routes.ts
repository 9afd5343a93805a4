import { Router } from 'express';
import { studentInputSchema, studentMoveSchema, studentPatchSchema } from '@shared/api/student';
import { actorOf, requires, requiresAny } from '../core/policy';
import { nextPageLink } from '../core/list-query';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { listStudents } from './students-queries';
import { moveStudent } from './student-move';
import { createStudent, getStudent, updateStudent } from './students-service';

/**
 * `/api/students`: directors and viewers read their schools' students, the coordinator all;
 * a student reads only their own row. Directors and the coordinator change them. There is no
 * DELETE: a student who leaves is withdrawn (`PATCH { status: 'withdrawn' }`), keeping history.
 */
export function studentsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/students', requires('roster:read'), async (request, response) => {
    const { next, ...page } = await listStudents(db, actorOf(request), request.query);
    if (next) response.set('Link', nextPageLink(request.originalUrl, next));
    response.json(page);
  });
  router.get(
    '/students/:id',
    requiresAny('roster:read', 'self:read'),
    async (request, response) => {
      response.json(await getStudent(db, actorOf(request), parseId(request.params['id'])));
    },
  );
  router.post('/students', requires('roster:write'), async (request, response) => {
    const input = parseInput(studentInputSchema, request.body, 'The student');
    response.status(201).json(await createStudent(db, actorOf(request), input));
  });
  router.patch('/students/:id', requires('roster:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(studentPatchSchema, request.body, 'The change');
    const body = (request.body ?? {}) as { schoolId?: unknown };
    response.json(await updateStudent(db, actorOf(request), id, patch, body.schoolId));
  });
  router.post('/students/:id/move', requires('roster:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const move = parseInput(studentMoveSchema, request.body, 'The move');
    response.json(await moveStudent(db, actorOf(request), id, move));
  });
  return router;
}
