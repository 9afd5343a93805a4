import type { Articulation, Key, PatternId } from '../music/index';

/** One scale a rung asks for, played at quarter = `tempo` or faster. */
export interface Requirement {
  /** The requirement's stable code; pass-offs name it, across ladder versions. */
  id: string;
  /** In concert pitch; each player plays it in their written key. */
  key: Key;
  pattern: PatternId;
  /** Quarter note = tempo, at least. */
  tempo: number;
  articulation: Articulation;
  octaves: 1 | 2;
  /** Whether the requirement never blocks a rung (a stretch goal). */
  optional?: boolean;
  /** The instrument families it applies to; absent means every family. */
  families?: string[];
}

/** One step of the ladder, numbered 1, 2, 3… */
export interface Rung {
  number: number;
  title: string;
  requirements: Requirement[];
}

/** One hearing of one requirement: the tempo it was played at and whether it passed. */
export interface PassOffRecord {
  /** The code of the requirement heard. */
  requirementId: string;
  tempo: number;
  passed: boolean;
  /** ISO date, YYYY-MM-DD. */
  heardOn: string;
}

/** Whether a requirement applies to players of this instrument family. */
export function appliesTo(requirement: Requirement, family: string): boolean {
  return requirement.families === undefined || requirement.families.includes(family);
}

/**
 * Whether any pass-off of the requirement passed at or above its tempo. A later "not yet" does
 * not take a pass back, and a pass at a slower tempo than the requirement asks does not count.
 */
export function isMet(requirement: Requirement, passOffs: readonly PassOffRecord[]): boolean {
  return passOffs.some(
    (passOff) =>
      passOff.passed &&
      passOff.requirementId === requirement.id &&
      passOff.tempo >= requirement.tempo,
  );
}

function bestPassedTempos(passOffs: readonly PassOffRecord[]): Map<string, number> {
  const best = new Map<string, number>();
  for (const passOff of passOffs) {
    if (!passOff.passed) continue;
    const known = best.get(passOff.requirementId);
    if (known === undefined || passOff.tempo > known)
      best.set(passOff.requirementId, passOff.tempo);
  }
  return best;
}

function ordered(rungs: readonly Rung[]): Rung[] {
  return [...rungs].sort((first, second) => first.number - second.number);
}

/**
 * The codes of every requirement that applies to the family (optional ones included) and has
 * been met.
 */
export function metRequirements(
  rungs: readonly Rung[],
  passOffs: readonly PassOffRecord[],
  family: string,
): Set<string> {
  const best = bestPassedTempos(passOffs);
  const met = new Set<string>();
  for (const rung of rungs) {
    for (const requirement of rung.requirements) {
      if (!appliesTo(requirement, family)) continue;
      const tempo = best.get(requirement.id);
      if (tempo !== undefined && tempo >= requirement.tempo) met.add(requirement.id);
    }
  }
  return met;
}

/**
 * The student's rung: the highest rung N such that every non-optional requirement that applies
 * to their family, in rungs 1 to N, is met; 0 when rung 1 is not complete yet.
 *
 * A rung with no non-optional requirement for the family counts as passed once every rung below
 * it is, so the student climbs through it. That holds for empty rungs at the top of the ladder
 * as well: a string player who completes the last rung with string requirements stands on the
 * top rung even when the rungs above ask only winds for scales.
 */
export function currentRung(
  rungs: readonly Rung[],
  passOffs: readonly PassOffRecord[],
  family: string,
): number {
  const met = metRequirements(rungs, passOffs, family);
  let reached = 0;
  for (const rung of ordered(rungs)) {
    const complete = rung.requirements.every(
      (requirement) =>
        requirement.optional === true || !appliesTo(requirement, family) || met.has(requirement.id),
    );
    if (!complete) break;
    reached = rung.number;
  }
  return reached;
}

/**
 * What the student works on next: the requirements that apply to the family on the lowest rung
 * not yet complete, unmet ones first in ladder order; empty when the ladder is complete.
 */
export function nextRequirements(
  rungs: readonly Rung[],
  passOffs: readonly PassOffRecord[],
  family: string,
): { rung: number | null; requirements: Requirement[] } {
  const reached = currentRung(rungs, passOffs, family);
  const next = ordered(rungs).find((rung) => rung.number > reached);
  if (!next) return { rung: null, requirements: [] };
  const met = metRequirements(rungs, passOffs, family);
  return {
    rung: next.number,
    requirements: next.requirements.filter(
      (requirement) => appliesTo(requirement, family) && !met.has(requirement.id),
    ),
  };
}
