/**
 * Things a role may do. Each API route asks for one (server/core/policy.ts); the web's
 * `CurrentUser.can()` takes the same names, so a misspelt one fails the type check. Kept free of
 * zod: the app shell imports it.
 */
export const capabilities = [
  'district:read',
  'district:settings',
  'schools:read',
  'schools:write',
  'years:write',
  'roster:read',
  'roster:write',
  'imports:run',
  'ladder:read',
  'ladder:write',
  'pass-offs:read',
  'pass-offs:write',
  'fleet:read',
  'fleet:write',
  'loans:read',
  'loans:write',
  'loans:return',
  'loans:see-waivers',
  'loans:agreement',
  'fees:manage',
  'repairs:write',
  'counts:run',
  'reports:read',
  'reports:send',
  'outbox:read',
  'people:manage',
  'district:backup',
  'tokens:own',
  'practice:read',
  'self:read',
  'takes:own',
  'takes:hear',
  'takes:retention',
] as const;
export type Capability = (typeof capabilities)[number];
