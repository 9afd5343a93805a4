import { inject } from '@angular/core';
import type { CanActivateFn } from '@angular/router';
import type { Capability } from '@shared/api/capabilities';
import { CurrentUser } from './current-user';

/** Lets the route open only for a signed-in user; anyone else goes to sign in first. */
export const signedInGuard: CanActivateFn = async (_route, state) => {
  const currentUser = inject(CurrentUser);
  const me = await currentUser.load();
  if (me) return true;
  currentUser.signIn(state.url);
  return false;
};

/** Lets the route open only when the role grants the capability named in its data. */
export const capabilityGuard: CanActivateFn = async (route) => {
  const currentUser = inject(CurrentUser);
  await currentUser.load();
  const needed = route.data['capability'] as Capability | undefined;
  return !needed || currentUser.can(needed);
};
