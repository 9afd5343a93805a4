import type { ensembles } from '../db/schema/index';

/** The kinds of ensemble the database holds. */
export type EnsembleKind = (typeof ensembles.$inferInsert)['kind'];

// Names school ensembles commonly carry, checked in this order (common practice, no source).
const kindByName: readonly [RegExp, EnsembleKind][] = [
  [/\bjazz\b/i, 'jazz-band'],
  [/\b(orchestra|strings?)\b/i, 'string-orchestra'],
  [/\bbeginn(ing|er|ers)\b.*\bband\b/i, 'beginning-band'],
  [/\b(symphonic|winds?)\b/i, 'symphonic-band'],
  [/\bmarching\b/i, 'marching-band'],
  [/\bpercussion\b/i, 'percussion-ensemble'],
];

/**
 * The kind of a new ensemble, guessed from its name: "Jazz Band" is a jazz band, "Chamber
 * Orchestra" and "Strings 7" string orchestras, "Beginning Band" a beginning band, "Symphonic
 * Band" and "Wind Ensemble" symphonic bands, "Marching Band" and "Percussion Ensemble" their own
 * kinds; anything else a concert band.
 */
export function guessEnsembleKind(name: string): EnsembleKind {
  for (const [pattern, kind] of kindByName) if (pattern.test(name)) return kind;
  return 'concert-band';
}
