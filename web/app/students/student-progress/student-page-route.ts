import { inject } from '@angular/core';
import type { CanActivateFn, UrlMatcher, UrlSegment } from '@angular/router';
import { CurrentUser } from '../../core/auth/current-user';

/**
 * Matches `/students/<number>` exactly, so the progress page sits beside the roster's own
 * `/students/new` and `/students/:id/edit` without taking them over.
 */
export const studentPageMatcher: UrlMatcher = (segments: UrlSegment[]) =>
  segments.length === 2 && segments[0]!.path === 'students' && /^\d+$/.test(segments[1]!.path)
    ? { consumed: segments, posParams: { id: segments[1]! } }
    : null;

/** Staff who read pass-offs, and a student for their own page (the server checks which student). */
export const studentPageGuard: CanActivateFn = async () => {
  const currentUser = inject(CurrentUser);
  await currentUser.load();
  return currentUser.can('pass-offs:read') || currentUser.can('self:read');
};
