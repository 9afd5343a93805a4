import { parseNote, type Letter } from '@shared/music';
import type { NotatedPiece } from '@shared/music/measure-layout';
import type { StaffMusic } from '../sheet';

/** The widest a staff is drawn; the SVG then scales to its box. */
export const staffWidth = 1000;

/** The narrowest a staff is drawn, for a phone's width (a few measures a line). */
export const narrowestStaff = 300;

/**
 * The width to draw a staff at for a box this many CSS pixels wide: the box's own width up to
 * `staffWidth`, so on a narrow screen the music wraps onto more lines at the size it has on a
 * wide one instead of shrinking (10 px between staff lines, VexFlow's default), never below
 * `narrowestStaff`.
 */
export function drawingWidth(boxWidth: number): number {
  if (!(boxWidth > 0)) return staffWidth;
  return Math.max(narrowestStaff, Math.min(staffWidth, Math.floor(boxWidth)));
}

/** Pixels between two staff lines, VexFlow's default. */
export const lineSpacing = 10;

/** How measures are grouped into lines of music (systems). */
export interface SystemPlan {
  /** Indexes of the measures on each system. */
  systems: number[][];
}

/** The diatonic step of each clef's top staff line (C0 = 0, one step per letter). */
const topLineStep: Record<StaffMusic['clef'], number> = {
  // Treble F5, bass A3, alto G4.
  treble: step('F5'),
  bass: step('A3'),
  alto: step('G4'),
};

const sharpOrder: Letter[] = ['F', 'C', 'G', 'D', 'A', 'E', 'B'];

/** The diatonic step of a note with octave: its letter's place plus seven per octave. */
export function step(note: string): number {
  const pitch = parseNote(note, true);
  return 'CDEFGAB'.indexOf(pitch.letter) + 7 * (pitch.octave as number);
}

/** Width of the clef and key signature opening each system, and the time signature on the first. */
export function openingWidth(fifths: number, first: boolean): number {
  return 44 + 11 * Math.abs(fifths) + (first ? 30 : 0);
}

/** A measure's comfortable width: room for each piece, more for the short ones. */
export function measureWidth(pieces: NotatedPiece[], compact: boolean): number {
  const perPiece = compact ? 30 : 44;
  return (compact ? 20 : 30) + pieces.length * perPiece;
}

/**
 * Splits measures into systems of about equal length that fit `width`: as few systems as
 * fit, then the measures shared out evenly, as a copyist balances the lines of a page.
 */
export function planSystems(
  measures: NotatedPiece[][],
  fifths: number,
  compact: boolean,
  width = staffWidth,
): SystemPlan {
  const widths = measures.map((pieces) => measureWidth(pieces, compact));
  const total = widths.reduce((sum, width) => sum + width, 0);
  const room = width - openingWidth(fifths, false) - 10;
  let count = Math.max(1, Math.ceil(total / room));
  const perSystem = () => Math.ceil(measures.length / count);
  while (count < measures.length && !fits(widths, perSystem(), room)) count += 1;
  const size = perSystem();
  const systems: number[][] = [];
  for (let start = 0; start < measures.length; start += size) {
    systems.push(measures.slice(start, start + size).map((_, index) => start + index));
  }
  return { systems };
}

function fits(widths: number[], size: number, room: number): boolean {
  for (let start = 0; start < widths.length; start += size) {
    const line = widths.slice(start, start + size).reduce((sum, width) => sum + width, 0);
    if (line > room) return false;
  }
  return true;
}

/**
 * The room a system needs above its top line and below its bottom line for ledger-line notes,
 * their stems and slurs, in pixels; never less than four spaces (three on a compact staff).
 */
export function verticalRoom(
  pieces: NotatedPiece[],
  clef: StaffMusic['clef'],
  compact: boolean,
  /** Octaves the notes sound above where an octave clef shows them. */
  octaveChange = 0,
): { above: number; below: number } {
  const top = topLineStep[clef];
  const bottom = top - 8;
  let highest = bottom;
  let lowest = top;
  for (const piece of pieces) {
    if (piece.note === null) continue;
    const place = step(piece.note) - 7 * octaveChange;
    highest = Math.max(highest, place);
    lowest = Math.min(lowest, place);
  }
  const half = lineSpacing / 2;
  const least = (compact ? 3 : 4) * lineSpacing;
  return {
    above: Math.max(least, (highest - top) * half + 3 * lineSpacing),
    below: Math.max(least, (bottom - lowest) * half + 3 * lineSpacing),
  };
}

/** The alteration a key signature gives a letter (sharps in the order F C G D A E B). */
export function signatureAlteration(letter: Letter, fifths: number): number {
  const place = sharpOrder.indexOf(letter);
  if (fifths > 0) return place < fifths ? 1 : 0;
  if (fifths < 0) return 6 - place < -fifths ? -1 : 0;
  return 0;
}

/** The name VexFlow gives the major key with this many sharps or flats. */
export function keySpecFor(fifths: number): string {
  const names = ['Cb', 'Gb', 'Db', 'Ab', 'Eb', 'Bb', 'F', 'C', 'G', 'D', 'A', 'E', 'B', 'F#', 'C#'];
  return names[Math.max(-7, Math.min(7, fifths)) + 7];
}
