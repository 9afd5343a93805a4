import sax from 'sax';
import { logoByteLimit } from '@shared/api/district';
import { badRequest } from '../core/errors';

/** A logo that passed the checks, ready to store. */
export interface CheckedLogo {
  type: 'image/png' | 'image/svg+xml';
  bytes: Buffer;
}

// PNG (ISO/IEC 15948, section 5.2): every PNG datastream begins with these eight bytes.
const pngSignature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

// SVG 1.1 and SVG 2 elements that run script, embed other documents or pull in other resources.
const forbiddenElements = new Set([
  'script',
  'foreignobject',
  'iframe',
  'embed',
  'object',
  'audio',
  'video',
  'canvas',
  'handler',
  'listener',
  'animation',
  'set',
  'animate',
  'animatemotion',
  'animatetransform',
]);

function refuse(reason: string): never {
  throw badRequest(`The logo was not stored: ${reason}`, [{ field: 'logo', message: reason }]);
}

/** Whether a reference stays inside the SVG document itself (`#id`). */
function isLocalReference(value: string): boolean {
  return value.trim().startsWith('#');
}

// CSS Values 4 `url()` and `@import` pull other resources into a style; only `url(#id)` stays local.
function hasExternalStyleReference(style: string): boolean {
  if (/@import/i.test(style)) return true;
  for (const match of style.matchAll(/url\(\s*(['"]?)([^'")]*)\1\s*\)/gi)) {
    if (!isLocalReference(match[2] ?? '')) return true;
  }
  return /expression\s*\(|javascript:/i.test(style);
}

/**
 * Checks an SVG logo and refuses it when it could run script or load anything from elsewhere:
 * script-bearing elements, `on…` event attributes, links and `url()` references that leave the
 * document, DOCTYPE declarations (entities). What is left is drawing only.
 */
export function checkSvg(text: string): void {
  if (/<!DOCTYPE|<!ENTITY/i.test(text))
    refuse('an SVG with a DOCTYPE (entity declarations) is not accepted.');
  const parser = sax.parser(true, { xmlns: false, lowercase: false });
  let root: string | undefined;
  let styleDepth = 0;
  let problem: string | undefined;
  const note = (reason: string) => {
    problem ??= reason;
  };
  parser.ondoctype = () => note('an SVG with a DOCTYPE (entity declarations) is not accepted.');
  parser.onprocessinginstruction = (instruction) => {
    if (instruction.name.toLowerCase() !== 'xml')
      note('an SVG with processing instructions is not accepted.');
  };
  parser.onopentag = (tag) => {
    const local = tag.name.split(':').pop()!.toLowerCase();
    root ??= local;
    if (forbiddenElements.has(local))
      note(`the SVG has a <${tag.name}> element, which can run script or load other content.`);
    if (local === 'style') styleDepth += 1;
    for (const [name, rawValue] of Object.entries(tag.attributes)) {
      const value = String(rawValue);
      const attribute = name.toLowerCase();
      if (attribute.startsWith('on'))
        note(`the SVG has an event attribute (${name}), which runs script.`);
      if (
        (attribute === 'href' || attribute.endsWith(':href') || attribute === 'src') &&
        !isLocalReference(value)
      )
        note(`the SVG refers to something outside itself (${name}="${value.slice(0, 60)}").`);
      if (hasExternalStyleReference(value))
        note(`the SVG's ${name} attribute refers to something outside itself.`);
    }
  };
  parser.onclosetag = (name) => {
    if (name.split(':').pop()!.toLowerCase() === 'style') styleDepth -= 1;
  };
  const onText = (text: string) => {
    if (styleDepth > 0 && hasExternalStyleReference(text))
      note('the SVG has a style that refers to something outside itself.');
  };
  parser.ontext = onText;
  parser.oncdata = onText;
  try {
    parser.write(text).close();
  } catch (error) {
    refuse(`the SVG is not well-formed XML (${(error as Error).message.split('\n')[0]}).`);
  }
  if (root !== 'svg') refuse('the file is not an SVG image (its root element is not <svg>).');
  if (problem) refuse(problem);
}

/**
 * Reads an uploaded logo given as a data URL: a PNG, or an SVG that can neither run script nor
 * load anything, at most 1 MB. Anything else is refused with the reason.
 */
export function checkLogo(dataUrl: string): CheckedLogo {
  const match = /^data:([a-z0-9.+/-]+)(;[a-z0-9=-]+)*?;base64,([A-Za-z0-9+/=\s]*)$/i.exec(dataUrl);
  if (!match) refuse('send the image as a base64 data URL (data:image/png;base64,…).');
  const declared = match[1]!.toLowerCase();
  const bytes = Buffer.from(match[3]!, 'base64');
  if (bytes.length === 0) refuse('the file is empty.');
  if (bytes.length > logoByteLimit)
    refuse(`the file is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; a logo is at most 1 MB.`);
  if (declared === 'image/png') {
    if (!bytes.subarray(0, 8).equals(pngSignature)) refuse('the file is not a PNG image.');
    return { type: 'image/png', bytes };
  }
  if (declared === 'image/svg+xml') {
    checkSvg(bytes.toString('utf8'));
    return { type: 'image/svg+xml', bytes };
  }
  return refuse(`a logo is a PNG or an SVG image, not ${declared}.`);
}

/**
 * The size a logo is drawn at: at most `maxHeight` high, and no wider than `maxWidth`, keeping
 * its proportions. PNG: the IHDR chunk's width and height (ISO/IEC 15948, 11.2.2); SVG: its
 * viewBox, or its width and height.
 */
export function logoAspect(logo: CheckedLogo): number {
  if (logo.type === 'image/png' && logo.bytes.length >= 24) {
    const width = logo.bytes.readUInt32BE(16);
    const height = logo.bytes.readUInt32BE(20);
    return width > 0 && height > 0 ? width / height : 1;
  }
  const text = logo.bytes.toString('utf8');
  const viewBox = /viewBox\s*=\s*["']\s*[-\d.]+[\s,]+[-\d.]+[\s,]+([\d.]+)[\s,]+([\d.]+)/i.exec(
    text,
  );
  if (viewBox) return Number(viewBox[1]) / Number(viewBox[2]) || 1;
  const width = /<svg[^>]*\swidth\s*=\s*["']([\d.]+)/i.exec(text);
  const height = /<svg[^>]*\sheight\s*=\s*["']([\d.]+)/i.exec(text);
  return width && height ? Number(width[1]) / Number(height[1]) || 1 : 1;
}
