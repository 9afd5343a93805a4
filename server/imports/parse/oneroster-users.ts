import type { ParsedCsv } from './parse-csv';
import {
  bundleRecord,
  checkedStatus,
  listOf,
  type BundleRecord,
  type IndexedFile,
} from './oneroster-records';
import type { OneRosterVersion } from './oneroster-manifest';
import type { RowError } from './parsed-roster';

/** A user of the bundle with the roles and orgs its version gives it. */
export interface BundleUser {
  sourcedId: string;
  record: BundleRecord;
  /** Its roles in lower case (student, teacher, parent, guardian, …). */
  roles: Set<string>;
  /** Its orgs, the primary one first. */
  orgIds: string[];
}

/**
 * The bundle's users with their roles and orgs. OneRoster 1.1 (CSV Tables §2.1 users.csv) gives
 * each user one `role` and its `orgSourcedIds`. OneRoster 1.2 (CSV Binding §3 users.csv and
 * roles.csv) moves them to roles.csv, one row per user, role and org, with `roleType` primary
 * or secondary; users.csv keeps `primaryOrgSourcedId`. Roles rows to be deleted are skipped.
 */
export function usersWithRoles(
  version: OneRosterVersion,
  users: IndexedFile,
  roles: ParsedCsv | undefined,
  errors: RowError[],
): { users: Map<string, BundleUser>; skippedRoles: number; roleOf: Map<string, Set<string>> } {
  const found = new Map<string, BundleUser>();
  // Every role a user has, deleted users and rows included: a delta's tobedeleted user is
  // withdrawn only when it is a student.
  const roleOf = new Map<string, Set<string>>();
  let skippedRoles = 0;
  if (version === '1.1') {
    for (const [id, record] of [...users.active, ...users.deleted]) {
      const role = record.cell('role').toLowerCase();
      roleOf.set(id, new Set([role]));
      if (!users.active.has(id)) continue;
      found.set(id, {
        sourcedId: id,
        record,
        roles: new Set([role]),
        orgIds: listOf(record.cell('orgSourcedIds')),
      });
    }
    return { users: found, skippedRoles, roleOf };
  }
  for (const [id, record] of users.active) {
    const primary = record.cell('primaryOrgSourcedId');
    found.set(id, { sourcedId: id, record, roles: new Set(), orgIds: primary ? [primary] : [] });
  }
  const secondaryOrgs = new Map<string, string[]>();
  for (const csvRecord of roles?.records ?? []) {
    const entry = bundleRecord('roles.csv', csvRecord);
    const status = checkedStatus(entry, errors);
    if (status === undefined) continue;
    const userId = entry.cell('userSourcedId');
    const role = entry.cell('role').toLowerCase();
    const known = roleOf.get(userId) ?? new Set<string>();
    known.add(role);
    roleOf.set(userId, known);
    if (status === 'tobedeleted') {
      skippedRoles++;
      continue;
    }
    const user = found.get(userId);
    if (!user) {
      if (users.deleted.has(userId)) {
        skippedRoles++;
        continue;
      }
      errors.push({
        line: entry.line,
        column: 'roles.csv:userSourcedId',
        message: `User '${userId}' is not in users.csv.`,
      });
      continue;
    }
    user.roles.add(role);
    const orgId = entry.cell('orgSourcedId');
    if (!orgId) continue;
    if (entry.cell('roleType').toLowerCase() === 'primary') {
      if (!user.orgIds.includes(orgId)) user.orgIds.push(orgId);
    } else secondaryOrgs.set(userId, [...(secondaryOrgs.get(userId) ?? []), orgId]);
  }
  for (const [userId, orgIds] of secondaryOrgs) {
    const user = found.get(userId)!;
    for (const orgId of orgIds) if (!user.orgIds.includes(orgId)) user.orgIds.push(orgId);
  }
  return { users: found, skippedRoles, roleOf };
}

// OneRoster 1.1 users.role and 1.2 roles.role: a student's agentSourcedIds name its parents,
// guardians and relatives, and theirs name the student. A relative is not taken as the guardian.
const guardianRoles = new Set(['parent', 'guardian']);

function hasRole(user: BundleUser | undefined, roles: ReadonlySet<string>): boolean {
  return user !== undefined && [...user.roles].some((role) => roles.has(role));
}

/** Each student's parents and guardians, linked from either side through agentSourcedIds. */
export function guardiansByStudent(users: Map<string, BundleUser>): Map<string, BundleUser[]> {
  const found = new Map<string, BundleUser[]>();
  const student = new Set(['student']);
  const link = (studentId: string, guardian: BundleUser) => {
    const list = found.get(studentId) ?? [];
    if (!list.includes(guardian)) list.push(guardian);
    found.set(studentId, list);
  };
  for (const [id, user] of users) {
    if (!user.roles.has('student')) continue;
    for (const agentId of listOf(user.record.cell('agentSourcedIds'))) {
      const agent = users.get(agentId);
      if (agent && hasRole(agent, guardianRoles)) link(id, agent);
    }
  }
  for (const user of users.values()) {
    if (!hasRole(user, guardianRoles)) continue;
    for (const studentId of listOf(user.record.cell('agentSourcedIds'))) {
      if (hasRole(users.get(studentId), student)) link(studentId, user);
    }
  }
  return found;
}
