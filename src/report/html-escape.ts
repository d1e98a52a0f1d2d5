/**
 * Escape text for HTML element content and attribute values.
 * @param s - any text
 * @returns the escaped text
 * @example escapeHtml('a < b & "c"') // 'a &lt; b &amp; &quot;c&quot;'
 */
export function escapeHtml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}
