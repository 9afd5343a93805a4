/** The tempo a pass-off may record (the pass-off input's own range). */
const lowest = 20;
const highest = 300;

/**
 * The tempos offered as one-tap choices for a requirement: its own tempo, two steps below it
 * (a student often passes a little under tempo) and one above, in steps of 8 beats a minute
 * (common practice, no source), kept within the range a pass-off may record.
 */
export function tempoPresets(tempo: number): number[] {
  return [tempo - 16, tempo - 8, tempo, tempo + 8].filter(
    (each) => each >= lowest && each <= highest,
  );
}
