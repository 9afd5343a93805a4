const replacements: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

/** Escapes text for HTML element content and quoted attribute values (HTML Living Standard). */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (character) => replacements[character] ?? character);
}
