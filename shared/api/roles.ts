import { z } from 'zod';

/** Everyone who signs in has exactly one of these roles. */
export const roles = ['coordinator', 'director', 'technician', 'viewer', 'student'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

/** How each role is named on screen. */
export const roleLabels: Record<Role, string> = {
  coordinator: 'District music coordinator',
  director: 'Director',
  technician: 'Instrument technician',
  viewer: 'Viewer (read-only)',
  student: 'Student',
};
