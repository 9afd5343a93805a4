import type { Me } from '@shared/api/me';
import { capabilitiesOf, seesAllSchools, type Actor } from '../core/policy';
import type { Database } from '../db/client';
import { schoolsOf } from '../people/people-queries';

/** Who is signed in, their role, schools and capabilities: the answer of `GET /api/me`. */
export async function describeMe(db: Database, actor: Actor): Promise<Me> {
  return {
    id: actor.userId,
    email: actor.email,
    name: actor.name,
    role: actor.role,
    allSchools: seesAllSchools(actor),
    schools: await schoolsOf(db, actor),
    studentId: actor.studentId,
    capabilities: capabilitiesOf(actor.role),
  };
}
