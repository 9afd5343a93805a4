import { httpResource } from '@angular/common/http';
import { computed, type Signal } from '@angular/core';
import { schoolListSchema, type School } from '@shared/api/school';
import type { FilterChoice } from '../core/grid/filter-select/filter-select';

/**
 * The schools the signed-in user may pick from, by name: what every school filter and school
 * field offers. Empty while they load, and when they cannot be read (the page still works with
 * its other data). Call it in an injection context (a field initialiser).
 */
export function injectSchoolChoices(options: { openOnly?: boolean } = {}): Signal<School[]> {
  const schools = httpResource(
    () => ({
      url: '/api/schools',
      params: { limit: 500, sort: 'name:asc', ...(options.openOnly ? { status: 'open' } : {}) },
    }),
    { parse: (body) => schoolListSchema.parse(body) },
  );
  return computed(() => (schools.hasValue() ? schools.value().rows : []));
}

/** Schools as a select's choices, each by its code and name ("code · name"). */
export function codedSchoolChoices(schools: readonly School[]): FilterChoice<number>[] {
  return schools.map((school) => ({ value: school.id, label: `${school.code} · ${school.name}` }));
}
