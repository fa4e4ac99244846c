/** A run of mail text: plain words or a web link. */
export type TextPart = { kind: 'text'; text: string } | { kind: 'link'; text: string; href: string };

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;

/**
 * Splits plain text into text and http(s) links, so a template can render links as
 * anchors without ever using innerHTML. Trailing punctuation stays outside the link.
 */
export function linkify(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    let url = match[0];
    const trailing = /[.,;:!?)\]]+$/.exec(url);
    if (trailing) url = url.slice(0, -trailing[0].length);
    const start = match.index;
    if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
    parts.push({ kind: 'link', text: url, href: url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
  return parts;
}
