import type { LadderRequirement, LadderRung } from '@shared/api/ladder';
import type { InstrumentFamily } from '@shared/music';
import { articulationLabels, familyLabels, modeLabels, patternLabels } from '../practice/labels';

/** A tonic with real accidentals, as a player reads it: 'Bb' → 'B♭', 'F#' → 'F♯'. */
export function tonicText(tonic: string): string {
  return tonic.replace(
    /^([A-G])(.*)$/,
    (_whole, letter: string, accidentals: string) =>
      letter + accidentals.replace(/b/g, '♭').replace(/#/g, '♯'),
  );
}

/** The requirement's concert key in words: 'B♭ major', 'C chromatic'. */
export function keyText(requirement: Pick<LadderRequirement, 'tonic' | 'mode'>): string {
  return `${tonicText(requirement.tonic)} ${modeLabels[requirement.mode].toLowerCase()}`;
}

/** The pattern in words: 'Long tones (whole notes)'. */
export function patternText(requirement: Pick<LadderRequirement, 'pattern'>): string {
  return patternLabels[requirement.pattern];
}

/** The articulation in words: 'Tongue up, slur down'. */
export function articulationText(requirement: Pick<LadderRequirement, 'articulation'>): string {
  return articulationLabels[requirement.articulation];
}

/** The metronome mark: '♩ = 72'. */
export function tempoText(tempo: number): string {
  return `♩ = ${tempo}`;
}

/** Who plays it: 'Every instrument' or 'Woodwinds, Brass'. */
export function familiesText(requirement: Pick<LadderRequirement, 'families'>): string {
  if (!requirement.families) return 'Every instrument';
  return requirement.families.map((family) => familyLabels[family as InstrumentFamily]).join(', ');
}

/** Whether the requirement is asked of a player of the family (no families = everyone). */
export function appliesToFamily(
  requirement: Pick<LadderRequirement, 'families'>,
  family: string | null,
): boolean {
  return (
    !requirement.families ||
    (family !== null && (requirement.families as string[]).includes(family))
  );
}

/** The one-line summary used in lists: 'B♭ major · Long tones (whole notes) · ♩ = 60 · 1 octave'. */
export function requirementSummary(requirement: LadderRequirement): string {
  const octaves = requirement.octaves === 2 ? '2 octaves' : '1 octave';
  return `${keyText(requirement)} · ${patternText(requirement)} · ${tempoText(requirement.tempo)} · ${octaves}`;
}

/** The query of the practice sheet for the requirement, played on the instrument. */
export function practiceQuery(
  requirement: LadderRequirement,
  instrumentId: string,
): Record<string, string> {
  return {
    tonic: requirement.tonic,
    mode: requirement.mode,
    pattern: requirement.pattern,
    tempo: String(requirement.tempo),
    articulation: requirement.articulation,
    octaves: String(requirement.octaves),
    instrument: instrumentId,
  };
}

/** A rung's title without a leading 'Rung 3 — ', since the screen shows the number itself. */
export function rungTitleText(rung: Pick<LadderRung, 'number' | 'title'>): string {
  return rung.title.replace(/^\s*rung\s+\d+\s*[—–:-]\s*/i, '').trim() || rung.title;
}

/** Every requirement of the ladder by its code, with the rung it sits on. */
export function requirementsByCode(
  rungs: readonly LadderRung[],
): Map<string, { rung: number; requirement: LadderRequirement }> {
  return new Map(
    rungs.flatMap((rung) =>
      rung.requirements.map(
        (requirement) => [requirement.code, { rung: rung.number, requirement }] as const,
      ),
    ),
  );
}
