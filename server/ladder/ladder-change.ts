import { and, desc, eq, inArray } from 'drizzle-orm';
import {
  currentRung,
  metRequirements,
  type PassOffRecord,
  type Requirement,
  type Rung,
} from '@shared/ladder/index';
import type { LadderChangeNote } from '@shared/api/analytics';
import { keyName } from '@shared/music/index';
import { auditLog, ladderVersions } from '../db/schema/index';
import { loadRungs, toRuleRungs, type Queryable } from './ladder-queries';

const familyWords: Record<string, string> = {
  woodwind: 'woodwinds',
  brass: 'brass',
  percussion: 'percussion',
  strings: 'strings',
};

/** 'Bb major' as the ladder writes it: 'B♭ major'. */
function keyText(requirement: Requirement): string {
  return keyName(requirement.key).replace(
    /^([A-G])([#b]*)/,
    (_whole, letter: string, accidentals: string) =>
      letter + accidentals.replace(/b/g, '♭').replace(/#/g, '♯'),
  );
}

function forFamilies(requirement: Requirement): string {
  if (!requirement.families) return '';
  const words = requirement.families.map((family) => familyWords[family] ?? family);
  return ` for ${words.length > 1 ? `${words.slice(0, -1).join(', ')} and ${words.at(-1)}` : words[0]}`;
}

function applies(requirement: Requirement, family: string): boolean {
  return !requirement.families || requirement.families.includes(family);
}

/** Why one requirement of the new ladder, unmet, stands in the way where the old one did not. */
function reasonFor(requirement: Requirement, rung: number, before: Rung[], family: string): string {
  const what = `${keyText(requirement)}${forFamilies(requirement)}`;
  const earlierRung = before.find((candidate) =>
    candidate.requirements.some((other) => other.id === requirement.id),
  );
  const earlier = earlierRung?.requirements.find((other) => other.id === requirement.id);
  if (!earlierRung || !earlier) return `${what} was added to rung ${rung}`;
  if (earlierRung.number > rung)
    return `${what} moved from rung ${earlierRung.number} to rung ${rung}`;
  if (earlier.optional && !requirement.optional)
    return `${what} in rung ${rung} is no longer optional`;
  if (!applies(earlier, family))
    return `${what} in rung ${rung} now applies to ${familyWords[family] ?? family}`;
  if (requirement.tempo > earlier.tempo)
    return `${what} in rung ${rung} now asks for ♩ = ${requirement.tempo} (it was ${earlier.tempo})`;
  return `${what} in rung ${rung} changed`;
}

/** '4 December 2026'. */
function dayText(at: Date): string {
  return new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeZone: 'UTC' }).format(at);
}

/**
 * When the last publish (or roll-back) of the ladder lowered the student's rung, what changed
 * and when, in words; null when their rung did not drop.
 */
export async function rungDropNote(
  db: Queryable,
  active: { versionId: number; name: string; rungs: Rung[] },
  records: readonly PassOffRecord[],
  family: string,
): Promise<LadderChangeNote | null> {
  const [entry] = await db
    .select({ at: auditLog.at, before: auditLog.before })
    .from(auditLog)
    .where(
      and(
        eq(auditLog.entity, 'ladder-version'),
        eq(auditLog.entityId, String(active.versionId)),
        inArray(auditLog.action, ['publish', 'restore']),
      ),
    )
    .orderBy(desc(auditLog.id))
    .limit(1);
  const previousId = (entry?.before as { archived?: number[] } | null)?.archived?.[0];
  if (!entry || previousId === undefined) return null;
  const [previous] = await db
    .select({ name: ladderVersions.name })
    .from(ladderVersions)
    .where(eq(ladderVersions.id, previousId));
  if (!previous) return null;
  const before = toRuleRungs(await loadRungs(db, previousId));
  const rungBefore = currentRung(before, records, family);
  const rungAfter = currentRung(active.rungs, records, family);
  if (rungAfter >= rungBefore) return null;
  const met = metRequirements(active.rungs, records, family);
  const reasons = active.rungs
    .filter((rung) => rung.number <= rungBefore)
    .flatMap((rung) =>
      rung.requirements
        .filter((requirement) => !requirement.optional && applies(requirement, family))
        .filter((requirement) => !met.has(requirement.id))
        .map((requirement) => reasonFor(requirement, rung.number, before, family)),
    );
  const changedOn = entry.at.toISOString().slice(0, 10);
  return {
    changedOn,
    previousVersionName: previous.name,
    versionName: active.name,
    rungBefore,
    rungAfter,
    reasons,
    message: `The ladder changed on ${dayText(entry.at)}: ${reasons.length ? reasons.join('; ') : `“${active.name}” replaced “${previous.name}”`} (rung ${rungBefore} before, ${rungAfter ? `rung ${rungAfter}` : 'no rung yet'} now).`,
  };
}
