import {
  Accidental,
  BarlineType,
  Beam,
  Clef,
  Dot,
  Formatter,
  Renderer,
  Stave,
  StaveNote,
  StaveTie,
  VexFlow,
  Voice,
  type RenderContext,
} from 'vexflow/core';
import { parseNote, type StaffClef } from '@shared/music';
import { beamOf, layOutMeasures, type NotatedPiece } from '@shared/music/measure-layout';
import type { StaffMusic } from '../sheet';
import { loadNotationFont, notationFontFamily } from './notation-font';
import { drawSlur, slurBelow, type PlacedNote } from './slurs';
import {
  keySpecFor,
  lineSpacing,
  measureWidth,
  openingWidth,
  planSystems,
  signatureAlteration,
  staffWidth as widest,
  verticalRoom,
} from './staff-layout';

/** One drawn piece and where it sits. */
interface DrawnPiece extends PlacedNote {
  piece: NotatedPiece;
  system: number;
}

const durations: Record<string, string> = {
  whole: 'w',
  half: 'h',
  quarter: 'q',
  eighth: '8',
  '16th': '16',
  '32nd': '32',
};

const accidentalSigns: Record<number, string> = { [-2]: 'bb', [-1]: 'b', 0: 'n', 1: '#', 2: '##' };

/** The key VexFlow places a rest on: the middle line of each clef. */
const restKeys: Record<StaffMusic['clef'], string> = { treble: 'b/4', bass: 'd/3', alto: 'c/4' };

/**
 * Draws a pattern as SVG into `host`: 4/4 measures from the engine's measure layout (so the
 * page and the MusicXML file agree), the clef, key signature and time signature, the metronome
 * mark above the first measure (left to the heading on a compact staff), accidentals only where the key signature and earlier notes of
 * the measure do not already give the pitch, ties, beams and slurs. Returns the number of notes
 * and rests drawn.
 */
export async function renderStaff(
  host: HTMLElement,
  music: StaffMusic,
  options: { compact: boolean; width?: number },
): Promise<number> {
  await loadNotationFont();
  VexFlow.setFonts(notationFontFamily, 'Public Sans');
  host.replaceChildren();

  const measures = layOutMeasures(music.notes);
  const staffWidth = options.width ?? widest;
  const { systems } = planSystems(measures, music.fifths, options.compact, staffWidth);
  const renderer = new Renderer(host as HTMLDivElement, Renderer.Backends.SVG);
  const context = renderer.getContext();
  const drawn: DrawnPiece[] = [];
  const gap = options.compact ? 0 : lineSpacing;
  let cursor = 0;
  let previousStretch = Infinity;

  systems.forEach((measureIndexes, system) => {
    const rooms = measureIndexes.map((index) =>
      verticalRoom(
        measures[index],
        clefOf(music, index).clef,
        options.compact,
        clefOf(music, index).octaveChange,
      ),
    );
    const room = {
      above: Math.max(...rooms.map(({ above }) => above)),
      below: Math.max(...rooms.map(({ below }) => below)),
    };
    const above = room.above + (system === 0 && !options.compact ? 3 * lineSpacing : 0);
    const topLine = cursor + above;
    const first = system === 0;
    const opening = openingWidth(music.fifths, first);
    const natural = measureIndexes.map((index) => measureWidth(measures[index], options.compact));
    const justified = (staffWidth - 2 - opening) / natural.reduce((sum, width) => sum + width, 0);
    // A short last line keeps the spacing of the line above instead of spreading its notes apart.
    const stretch =
      system === systems.length - 1 ? Math.min(justified, previousStretch * 1.35) : justified;
    previousStretch = justified;
    let x = 1;
    measureIndexes.forEach((measureIndex, position) => {
      const width = natural[position] * stretch + (position === 0 ? opening : 0);
      const stave = new Stave(x, topLine - 4 * lineSpacing, width);
      const clef = clefOf(music, measureIndex);
      markStave(stave, music, measureIndex, {
        opening: position === 0,
        first,
        compact: options.compact,
      });
      if (measureIndex === measures.length - 1) stave.setEndBarType(BarlineType.END);
      stave.setContext(context).draw();
      const notes = drawMeasure(context, stave, measures[measureIndex], music.fifths, clef);
      notes.forEach((note, index) =>
        drawn.push({ piece: measures[measureIndex][index], note, stave, system }),
      );
      x += width;
    });
    cursor = topLine + 4 * lineSpacing + room.below + gap;
  });

  drawTies(context, drawn);
  drawSlurs(context, drawn);
  renderer.resize(staffWidth, Math.ceil(cursor));
  fitToBox(host, staffWidth, Math.ceil(cursor));
  return drawn.length;
}

/**
 * What a measure's stave carries besides its notes: at the start of a line the clef and key
 * signature (and on the first line the time signature and metronome mark), inside a line a
 * change of clef.
 */
function markStave(
  stave: Stave,
  music: StaffMusic,
  measureIndex: number,
  line: { opening: boolean; first: boolean; compact: boolean },
): void {
  const clef = clefOf(music, measureIndex);
  if (line.opening) {
    stave.setBegBarType(BarlineType.NONE);
    addClef(stave, clef);
    stave.addKeySignature(keySpecFor(music.fifths));
    // Room between the time signature and the first note, as engravers leave it.
    if (line.first) stave.addTimeSignature('4/4', 26);
    // A compact staff sits under a heading that already names the tempo.
    if (line.first && !line.compact) {
      stave.setTempo({ duration: 'q', bpm: music.tempo }, -lineSpacing);
    }
    return;
  }
  // A clef change inside a line of music (the marimba's low measures) is drawn small.
  const before = measureIndex > 0 ? clefOf(music, measureIndex - 1) : clef;
  if (before.clef !== clef.clef || before.octaveChange !== clef.octaveChange) {
    addClef(stave, clef, 'small');
  }
}

/** Lets the drawn SVG scale to its box, and hides it from screen readers. */
function fitToBox(host: HTMLElement, width: number, height: number): void {
  const svg = host.querySelector('svg');
  if (!svg) return;
  svg.setAttribute('viewBox', `0 0 ${width} ${height}`);
  svg.removeAttribute('width');
  svg.removeAttribute('height');
  // The renderer sets its size as an inline style too, which would keep the staff from
  // scaling to its box.
  svg.style.removeProperty('width');
  svg.style.removeProperty('height');
  svg.setAttribute('aria-hidden', 'true');
}

/** The clef of a measure; a staff without per-measure clefs keeps its one clef throughout. */
function clefOf(music: StaffMusic, measureIndex: number): StaffClef {
  return music.clefs?.[measureIndex] ?? { clef: music.clef, octaveChange: 0 };
}

/** SMuFL glyphs of the treble clef with 15 above it (VexFlow names only the 8va and 8vb). */
const gClef15ma = '\uE054';

function addClef(stave: Stave, { clef, octaveChange }: StaffClef, size = 'default'): void {
  const annotation = octaveChange > 0 ? '8va' : octaveChange < 0 ? '8vb' : undefined;
  stave.addClef(clef, size, annotation);
  if (octaveChange === 2) {
    const drawn = stave.getModifiers().find((modifier) => modifier instanceof Clef);
    if (drawn) drawn.setText(gClef15ma);
  }
}

function drawMeasure(
  context: RenderContext,
  stave: Stave,
  pieces: NotatedPiece[],
  fifths: number,
  { clef, octaveChange }: StaffClef,
): StaveNote[] {
  const shown = new Map<string, number>();
  const notes = pieces.map((piece) => {
    const rest = piece.note === null;
    const note = new StaveNote({
      clef,
      keys: [rest ? restKeys[clef] : vexKey(piece.note as string, octaveChange)],
      duration: `${durations[piece.type]}${rest ? 'r' : ''}`,
      dots: piece.dotted ? 1 : 0,
      autoStem: !rest,
      alignCenter: rest && piece.beats === 4,
    });
    if (piece.dotted) Dot.buildAndAttach([note], { all: true });
    if (!rest) {
      const pitch = parseNote(piece.note as string, true);
      const place = `${pitch.letter}${pitch.octave}`;
      const current = shown.get(place) ?? signatureAlteration(pitch.letter, fifths);
      // A note tied over the bar line keeps its pitch without a new sign.
      if (current !== pitch.alteration && !piece.tieStop) {
        note.addModifier(new Accidental(accidentalSigns[pitch.alteration]), 0);
      }
      shown.set(place, pitch.alteration);
    }
    return note;
  });
  const beams = pieces.flatMap((_, index) =>
    beamOf(pieces, index) === 'begin' ? [new Beam([notes[index], notes[index + 1]], true)] : [],
  );
  const voice = new Voice({ numBeats: 4, beatValue: 4 }).addTickables(notes);
  new Formatter().joinVoices([voice]).formatToStave([voice], stave);
  voice.draw(context, stave);
  beams.forEach((beam) => beam.setContext(context).draw());
  return notes;
}

/** VexFlow's key for a note, shown `octaveChange` octaves below its sound under an octave clef. */
function vexKey(note: string, octaveChange: number): string {
  const pitch = parseNote(note, true);
  const sign = pitch.alteration > 0 ? '#'.repeat(pitch.alteration) : 'b'.repeat(-pitch.alteration);
  return `${pitch.letter.toLowerCase()}${sign}/${(pitch.octave as number) - octaveChange}`;
}

function drawTies(context: RenderContext, drawn: DrawnPiece[]): void {
  drawn.forEach(({ piece, note, system }, index) => {
    const next = drawn[index + 1];
    if (!piece.tieStart || !next) return;
    const ends = (firstNote: StaveNote | null, lastNote: StaveNote | null) =>
      new StaveTie({ firstNote, lastNote, firstIndexes: [0], lastIndexes: [0] })
        .setContext(context)
        .draw();
    if (next.system === system) {
      ends(note, next.note);
    } else {
      ends(note, null);
      ends(null, next.note);
    }
  });
}

/** Slurs from each slurred group's first piece to its last, broken where a line of music ends. */
function drawSlurs(context: RenderContext, drawn: DrawnPiece[]): void {
  let start: number | undefined;
  drawn.forEach(({ piece }, index) => {
    if (piece.slurStart) start = index;
    if (piece.slurStop && start !== undefined) {
      const group = drawn.slice(start, index + 1);
      const systems = [...new Set(group.map(({ system }) => system))];
      const below = slurBelow(group);
      systems.forEach((system, position) => {
        const segment = group.filter((entry) => entry.system === system);
        drawSlur(context, segment, {
          below,
          opensBefore: position > 0,
          continuesAfter: position < systems.length - 1,
        });
      });
      start = undefined;
    }
  });
}
