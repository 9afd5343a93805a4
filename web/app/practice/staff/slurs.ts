import { Stem, type RenderContext, type Stave, type StaveNote } from 'vexflow/core';

/** A drawn note with the measure it stands in. */
export interface PlacedNote {
  note: StaveNote;
  stave: Stave;
}

/** Thickness of a slur at its middle, in pixels. */
const thickness = 2.5;

/**
 * Whether a slur over these notes goes below them. Placement follows common engraving
 * practice (no single source): when every stem points up the slur goes below the noteheads,
 * otherwise above the group, from the notehead of a stem-down note or the stem tip of a
 * stem-up note.
 */
export function slurBelow(notes: PlacedNote[]): boolean {
  return notes.every(({ note }) => note.getStemDirection() === Stem.UP);
}

/**
 * Draws one slur, or the part of it on one system (a line of music): `opensBefore` starts it
 * at the beginning of the line (it continues from the line above) and `continuesAfter` runs it
 * to the end of the line. The curve bows just enough to clear every note between its ends.
 */
export function drawSlur(
  context: RenderContext,
  segment: PlacedNote[],
  placement: { below: boolean; opensBefore: boolean; continuesAfter: boolean },
): void {
  if (segment.length === 0) return;
  const { below, opensBefore, continuesAfter } = placement;
  const first = segment[0];
  const last = segment[segment.length - 1];
  const edge = (note: StaveNote) => (below ? lowestPoint(note) + 5 : highestPoint(note) - 5);

  // A slur continued from the line above starts just clear of the clef and key signature.
  const x0 = opensBefore ? first.stave.getNoteStartX() + 3 : headCentre(first.note) + 3;
  const x1 = continuesAfter
    ? last.stave.getX() + last.stave.getWidth() - 3
    : headCentre(last.note) - 3;
  if (x1 - x0 < 6) return;
  const y0 = edge(first.note);
  const y1 = edge(last.note);

  // How far the middle must bow out from the straight line for every inner note to clear it.
  let bow = 9;
  for (const { note } of segment) {
    const t = Math.min(0.92, Math.max(0.08, (headCentre(note) - x0) / (x1 - x0)));
    const chord = y0 + t * (y1 - y0);
    const need = below ? edge(note) - chord : chord - edge(note);
    bow = Math.max(bow, need / (3 * t * (1 - t)));
  }
  bow = Math.min(bow, 60) * (below ? 1 : -1);

  const c1x = x0 + (x1 - x0) / 3;
  const c2x = x0 + (2 * (x1 - x0)) / 3;
  const c1y = y0 + (y1 - y0) / 3 + bow;
  const c2y = y0 + (2 * (y1 - y0)) / 3 + bow;
  const inner = below ? -thickness : thickness;
  context.openGroup('slur');
  context.beginPath();
  context.moveTo(x0, y0);
  context.bezierCurveTo(c1x, c1y, c2x, c2y, x1, y1);
  context.bezierCurveTo(c2x, c2y + inner, c1x, c1y + inner, x0, y0);
  context.closePath();
  context.fill();
  context.closeGroup();
}

function headCentre(note: StaveNote): number {
  return (note.getNoteHeadBeginX() + note.getNoteHeadEndX()) / 2;
}

/** The highest point of a note: its stem tip when the stem points up, else its notehead. */
function highestPoint(note: StaveNote): number {
  const head = note.getYs()[0] - 5;
  if (!note.hasStem() || note.getStemDirection() !== Stem.UP) return head;
  const { topY, baseY } = note.getStemExtents();
  return Math.min(head, topY, baseY);
}

/** The lowest point of a note: its stem tip when the stem points down, else its notehead. */
function lowestPoint(note: StaveNote): number {
  const head = note.getYs()[0] + 5;
  if (!note.hasStem() || note.getStemDirection() !== Stem.DOWN) return head;
  const { topY, baseY } = note.getStemExtents();
  return Math.max(head, topY, baseY);
}
