import iconv from 'iconv-lite';

/** A decoded upload and the encoding it was read in. */
export interface DecodedText {
  text: string;
  encoding: 'utf-8' | 'utf-16le' | 'windows-1252';
}

const strictUtf8 = new TextDecoder('utf-8', { fatal: true });
const lenientUtf8 = new TextDecoder('utf-8');
const utf16le = new TextDecoder('utf-16le');
const replacementCharacter = 0xfffd;

function hasUtf8ByteOrderMark(bytes: Uint8Array): boolean {
  return bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
}

function hasUtf16leByteOrderMark(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe;
}

/**
 * Windows-1252 per the WHATWG Encoding Standard (index-windows-1252). iconv-lite gives U+FFFD
 * for the five bytes the Windows code page leaves undefined (0x81, 0x8D, 0x8F, 0x90, 0x9D);
 * WHATWG maps each to the C1 control of the same number, and so does this.
 */
function decodeWindows1252(bytes: Uint8Array): string {
  const text = iconv.decode(
    Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    'win1252',
  );
  if (!text.includes('\uFFFD')) return text;
  let fixed = '';
  for (let index = 0; index < text.length; index++) {
    const code = text.charCodeAt(index);
    fixed += code === replacementCharacter ? String.fromCharCode(bytes[index]) : text[index];
  }
  return fixed;
}

/**
 * The text of an uploaded roster. As in the WHATWG Encoding Standard's "decode" algorithm, a byte
 * order mark decides first (UTF-8 EF BB BF, UTF-16LE FF FE) and is dropped. Without one the
 * fallback is a guess of our own: UTF-8 when the bytes are valid UTF-8, otherwise windows-1252,
 * the encoding spreadsheet programs on Windows save "CSV" in (and the one WHATWG gives the labels
 * latin1, iso-8859-1 and ascii). Never throws.
 */
export function decodeText(bytes: Uint8Array): DecodedText {
  if (hasUtf8ByteOrderMark(bytes)) {
    return { text: lenientUtf8.decode(bytes.subarray(3)), encoding: 'utf-8' };
  }
  if (hasUtf16leByteOrderMark(bytes)) {
    return { text: utf16le.decode(bytes.subarray(2)), encoding: 'utf-16le' };
  }
  try {
    return { text: strictUtf8.decode(bytes), encoding: 'utf-8' };
  } catch {
    return { text: decodeWindows1252(bytes), encoding: 'windows-1252' };
  }
}
