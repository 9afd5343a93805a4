// VexFlow's package exports do not include its font modules; the declaration sits apart under
// build/types, so TypeScript cannot pair it with this file.
// @ts-expect-error: untyped module, typed below as the string it is
import { Bravura } from '../../../../node_modules/vexflow/build/esm/src/fonts/bravura.js';

/** The SMuFL music font VexFlow draws clefs, noteheads and accidentals with. */
export const notationFontFamily = 'Bravura';

let loading: Promise<void> | undefined;

/**
 * Makes the Bravura font available to the page once. VexFlow's own loader asks for it by a
 * data: URL, which the app's Content-Security-Policy (font-src 'self') refuses; a FontFace
 * made from the font's bytes is no fetch, so the policy stays as strict as it is.
 */
export function loadNotationFont(): Promise<void> {
  loading ??= (async () => {
    const dataUrl = Bravura as string;
    const base64 = dataUrl.slice(dataUrl.indexOf(',') + 1);
    const bytes = Uint8Array.from(atob(base64), (character) => character.charCodeAt(0));
    const face = new FontFace(notationFontFamily, bytes.buffer, { display: 'block' });
    document.fonts.add(await face.load());
  })();
  return loading;
}
