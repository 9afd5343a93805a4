import type { Capability } from '@shared/api/capabilities';

/** One entry of the left navigation rail. */
export interface NavigationItem {
  path: string;
  label: string;
  icon: string;
  /** The capability the role needs to see the entry (the server enforces it as well). */
  capability?: Capability;
  /** Roles that see this entry regardless of capability. */
  roles?: string[];
  /** Roles that never see it (a student has their own page instead of the district overview). */
  hiddenFor?: string[];
  group: 'district' | 'music' | 'fleet' | 'admin';
}

/** The screens of the app, in rail order. */
export const navigationItems: NavigationItem[] = [
  {
    path: '/overview',
    label: 'Overview',
    icon: 'space_dashboard',
    group: 'district',
    hiddenFor: ['student'],
  },
  {
    path: '/schools',
    label: 'Schools',
    icon: 'school',
    capability: 'schools:read',
    group: 'district',
  },
  {
    path: '/imports',
    label: 'Imports',
    icon: 'upload_file',
    capability: 'imports:run',
    group: 'district',
  },
  {
    path: '/ladder',
    label: 'Scale ladder',
    icon: 'stairs',
    capability: 'ladder:read',
    group: 'music',
  },
  {
    path: '/pass-offs',
    label: 'Pass-offs',
    icon: 'fact_check',
    capability: 'pass-offs:write',
    group: 'music',
  },
  {
    path: '/practice',
    label: 'Practice sheets',
    icon: 'music_note',
    capability: 'practice:read',
    group: 'music',
  },
  {
    path: '/instruments',
    label: 'Instruments',
    icon: 'piano',
    capability: 'fleet:read',
    group: 'fleet',
  },
  {
    path: '/loans',
    label: 'Loans',
    icon: 'handshake',
    capability: 'loans:read',
    roles: ['student'],
    group: 'fleet',
  },
  { path: '/fees', label: 'Fees', icon: 'payments', capability: 'loans:read', group: 'fleet' },
  { path: '/repairs', label: 'Repairs', icon: 'build', capability: 'fleet:read', group: 'fleet' },
  {
    path: '/counts',
    label: 'Annual count',
    icon: 'barcode_scanner',
    capability: 'counts:run',
    group: 'fleet',
  },
  {
    path: '/planning',
    label: 'Replacement plan',
    icon: 'inventory_2',
    capability: 'fleet:read',
    group: 'fleet',
  },
  {
    path: '/ensembles',
    label: 'Ensembles',
    icon: 'groups',
    capability: 'roster:read',
    group: 'district',
  },
  {
    path: '/students',
    label: 'Students',
    icon: 'person',
    capability: 'roster:read',
    group: 'district',
  },
  {
    path: '/school-years',
    label: 'School years',
    icon: 'event_repeat',
    capability: 'years:write',
    group: 'admin',
  },
  {
    path: '/people',
    label: 'People',
    icon: 'manage_accounts',
    capability: 'people:manage',
    group: 'admin',
  },
  // The coordinator reaches every token from People; other roles with tokens:own get their own page.
  {
    path: '/account/tokens',
    label: 'API tokens',
    icon: 'key',
    capability: 'tokens:own',
    hiddenFor: ['coordinator'],
    group: 'admin',
  },
  {
    path: '/district',
    label: 'District settings',
    icon: 'domain',
    capability: 'district:settings',
    group: 'admin',
  },
  {
    path: '/reports',
    label: 'Reports',
    icon: 'outgoing_mail',
    capability: 'reports:read',
    group: 'admin',
  },
];

export const navigationGroups: { id: NavigationItem['group']; label: string }[] = [
  { id: 'district', label: 'District' },
  { id: 'music', label: 'Music' },
  { id: 'fleet', label: 'Instruments' },
  { id: 'admin', label: 'Administration' },
];

/** The entries a user with these capabilities and role sees. */
export function visibleItems(role: string, capabilities: Set<string>): NavigationItem[] {
  return navigationItems.filter(
    (item) =>
      !item.hiddenFor?.includes(role) &&
      (item.roles?.includes(role) || !item.capability || capabilities.has(item.capability)),
  );
}
