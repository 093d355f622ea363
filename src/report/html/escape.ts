/** Text made safe inside HTML element content and double-quoted attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/**
 * Text made safe as a double-quoted CSS string inside a <style> element: every character outside
 * letters, digits, space and a few marks is written as a CSS hexadecimal escape, so no user text can
 * end the string, the rule or the element.
 */
export function cssString(text: string): string {
  return `"${[...text].map((c) => (/^[A-Za-z0-9 .,:;()_-]$/.test(c) ? c : `\\${c.codePointAt(0)!.toString(16)} `)).join('')}"`;
}
