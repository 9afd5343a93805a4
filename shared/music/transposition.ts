import { transpositionSize } from './instruments';
import { reverseSize, transposeBySize, transposeNote } from './interval';
import { checkKey, keySignature, type Key } from './keys';

/**
 * The written note an instrument plays to sound `concertNote`, spelled by the interval:
 * concert Bb3 is written C4 on the Bb clarinet and G4 on the Eb alto saxophone.
 */
export function toWritten(concertNote: string, instrumentId: string): string {
  return transposeBySize(concertNote, reverseSize(transpositionSize(instrumentId)));
}

/** The concert (sounding) note of a written note: written C4 on the clarinet sounds Bb3. */
export function toConcert(writtenNote: string, instrumentId: string): string {
  return transposeBySize(writtenNote, transpositionSize(instrumentId));
}

/**
 * The key an instrument's part is written in for a concert key.
 *
 * The concert tonic is transposed by the instrument's interval. When the result is not one of
 * the 15 standard key signatures (more than seven sharps or flats, e.g. G# major) or carries
 * more accidentals than its enharmonic twin (C# major, 7 sharps, against Db major, 5 flats),
 * the tonic is respelled enharmonically. On a tie (F# and Gb major, six each) the plain
 * transposition stays. A minor key is weighed by its own signature, so it always lands on one
 * of the 15 minor key names; a chromatic scale by the major signature of its tonic. The rule
 * applies to every instrument, so a concert C# major is written Db major even for the flute.
 *
 * Concert Bb major: clarinet C major, alto saxophone G major, horn F major.
 * Concert B major: clarinet Db major, alto saxophone Ab major.
 */
export function writtenKey(concert: Key, instrumentId: string): Key {
  checkKey(concert);
  const size = reverseSize(transpositionSize(instrumentId));
  return simplestSpelling({ tonic: transposeBySize(concert.tonic, size), mode: concert.mode });
}

/** A key spelled with seven accidentals at most and no more than its enharmonic twin. */
export function simplestSpelling(key: Key): Key {
  let spelled = key;
  while (Math.abs(keySignature(spelled)) > 7) {
    spelled = enharmonicTwin(spelled);
  }
  const twin = Math.abs(keySignature(spelled)) >= 5 ? enharmonicTwin(spelled) : spelled;
  return Math.abs(keySignature(twin)) < Math.abs(keySignature(spelled)) ? twin : spelled;
}

/**
 * The same key on the neighbouring letter: twelve fifths the other way round the circle
 * (C# ↔ Db, Cb ↔ B), found by moving the tonic a diminished second.
 */
function enharmonicTwin(key: Key): Key {
  const signature = keySignature(key);
  const tonic = transposeNote(key.tonic, signature > 0 ? '2d' : '-2d');
  return { tonic, mode: key.mode };
}
