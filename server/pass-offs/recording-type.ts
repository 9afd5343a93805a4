import type { RecordingContentType } from '@shared/api/pass-off';

const ascii = (bytes: Uint8Array, start: number, text: string) =>
  bytes.length >= start + text.length &&
  [...text].every((character, index) => bytes[start + index] === character.charCodeAt(0));

/**
 * The audio type of a file, read from its first bytes (never from its name or the type the
 * browser claimed); undefined when it is none of the types a recording may be.
 */
export function recordingTypeOf(bytes: Uint8Array): RecordingContentType | undefined {
  // Matroska/WebM: EBML header 1A 45 DF A3, with DocType "webm" (Matroska specification, RFC 9559).
  if (bytes[0] === 0x1a && bytes[1] === 0x45 && bytes[2] === 0xdf && bytes[3] === 0xa3) {
    const head = new TextDecoder('latin1').decode(bytes.subarray(0, 64));
    return head.includes('webm') ? 'audio/webm' : undefined;
  }
  // Ogg: capture pattern "OggS" (RFC 3533, section 6).
  if (ascii(bytes, 0, 'OggS')) return 'audio/ogg';
  // WAVE: "RIFF", a 4-byte size, then "WAVE" (Microsoft/IBM RIFF, Multimedia Programming Interface 1.0).
  if (ascii(bytes, 0, 'RIFF') && ascii(bytes, 8, 'WAVE')) return 'audio/wav';
  // MP4/M4A: a box of type "ftyp" first (ISO/IEC 14496-12, section 4.3).
  if (ascii(bytes, 4, 'ftyp')) return 'audio/mp4';
  // MP3: an ID3v2 tag ("ID3", id3.org ID3v2.3.0 section 3.1) or an MPEG audio frame sync:
  // eleven set bits, and a layer that is not the reserved 00 (ISO/IEC 11172-3, 2.4.1.3).
  if (ascii(bytes, 0, 'ID3')) return 'audio/mpeg';
  if (
    bytes.length >= 2 &&
    bytes[0] === 0xff &&
    (bytes[1]! & 0xe0) === 0xe0 &&
    (bytes[1]! & 0x06) !== 0
  ) {
    return 'audio/mpeg';
  }
  return undefined;
}

/** The file extension a stored recording of this type is offered for download with. */
export const recordingExtensions: Record<RecordingContentType, string> = {
  'audio/webm': 'webm',
  'audio/ogg': 'ogg',
  'audio/mpeg': 'mp3',
  'audio/wav': 'wav',
  'audio/mp4': 'm4a',
};
