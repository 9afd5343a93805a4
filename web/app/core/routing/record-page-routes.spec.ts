// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { describe, expect, it } from 'vitest';
import { capabilityGuard } from '../auth/signed-in-guard';
import { recordPageRoutes } from './record-page-routes';

class ListScreen {}
class RecordScreen {}
const listScreen = () => Promise.resolve(ListScreen);
const recordScreen = () => Promise.resolve(RecordScreen);

describe('recordPageRoutes', () => {
  const routes = recordPageRoutes({
    list: ['Rooms', listScreen],
    detail: recordScreen,
    create: ['Add a room', 'roster:write'],
    record: [':id/edit', 'Room'],
  });

  it('should put the list at the feature address and the record at its own path', () => {
    expect(routes.map((route) => route.path)).toEqual(['', 'new', ':id/edit']);
    expect(routes.map((route) => route.loadComponent)).toEqual([
      listScreen,
      recordScreen,
      recordScreen,
    ]);
    expect(routes.map((route) => route.title)).toEqual([
      'Rooms · Tuttiboard',
      'Add a room · Tuttiboard',
      'Room · Tuttiboard',
    ]);
  });

  it('should guard only the create page, with its capability and the id new', () => {
    expect(routes[1]?.canActivate).toEqual([capabilityGuard]);
    expect(routes[1]?.data).toEqual({ capability: 'roster:write', id: 'new' });
    expect(routes[0]?.canActivate).toBeUndefined();
    expect(routes[2]?.canActivate).toBeUndefined();
  });
});
