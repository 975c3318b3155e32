/**
 * User text as it may appear inside a one-line message: quoted, with line breaks and other control
 * characters escaped, cut to `max` characters with an ellipsis after the closing quote.
 *
 * @example showText('1\nx') // "\"1\\nx\""
 */
export function showText(text: string, max = 40): string {
  const chars = Array.from(text);
  const cut = chars.length > max;
  const kept = cut ? chars.slice(0, max).join('') : text;
  // JSON escapes C0 controls, quote and backslash; DEL, C1 controls and the Unicode line/paragraph
  // separators would still break a terminal line, so they are escaped too.
  const escaped = JSON.stringify(kept).replace(/[\u007f-\u009f\u2028\u2029]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
  return cut ? `${escaped}…` : escaped;
}
