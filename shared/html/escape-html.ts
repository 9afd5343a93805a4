const replacements: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

/**
 * Text (or a number) made safe for HTML element content and quoted attribute values: the five
 * characters the HTML Living Standard's syntax gives meaning there, as character references.
 */
export function escapeHtml(text: string | number): string {
  return String(text).replace(/[&<>"']/g, (character) => replacements[character] ?? character);
}
