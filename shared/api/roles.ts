/** Everyone who signs in has exactly one of these roles. Kept free of zod: the app shell imports it. */
export const roles = ['coordinator', 'director', 'technician', 'viewer', 'student'] as const;
export type Role = (typeof roles)[number];

/** How each role is named on screen. */
export const roleLabels: Record<Role, string> = {
  coordinator: 'District music coordinator',
  director: 'Director',
  technician: 'Instrument technician',
  viewer: 'Viewer (read-only)',
  student: 'Student',
};
