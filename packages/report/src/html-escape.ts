/**
 * Escapes text for HTML element content and quoted attribute values (& < > " ').
 * Everything from the data passes through here before it reaches the page.
 */
export function escapeHtml(text: string): string {
  return text
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}
