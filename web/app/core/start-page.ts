import { inject } from '@angular/core';
import { Router, type CanActivateFn } from '@angular/router';
import { CurrentUser } from './auth/current-user';

/** The first page after sign-in: a student's own progress, everyone else's Overview. */
export const startPage: CanActivateFn = async () => {
  const currentUser = inject(CurrentUser);
  const router = inject(Router);
  const me = await currentUser.load();
  return router.parseUrl(
    me?.role === 'student' && me.studentId ? `/students/${me.studentId}` : '/overview',
  );
};
