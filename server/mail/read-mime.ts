/** What the catcher keeps of a received message. */
export interface ReadMail {
  subject: string;
  text: string;
  html: string | null;
}

/**
 * Reads subject, plain text and HTML out of a MIME message as nodemailer writes it
 * (multipart/alternative, quoted-printable or base64 parts, encoded-word headers).
 * Deliberately small: it only has to read what our own mailer sends.
 */
export function readMime(raw: string): ReadMail {
  const { headers, body } = splitPart(raw);
  const found = { text: null as string | null, html: null as string | null };
  collectParts(headers, body, found);
  return { subject: decodeWords(headers.get('subject') ?? ''), text: found.text ?? '', html: found.html };
}

function splitPart(raw: string): { headers: Map<string, string>; body: string } {
  const normalized = raw.replace(/\r\n/g, '\n');
  const cut = normalized.indexOf('\n\n');
  const head = cut < 0 ? normalized : normalized.slice(0, cut);
  const body = cut < 0 ? '' : normalized.slice(cut + 2);
  const headers = new Map<string, string>();
  // Unfold continuation lines, then split "Name: value".
  for (const line of head.replace(/\n[ \t]+/g, ' ').split('\n')) {
    const colon = line.indexOf(':');
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  return { headers, body };
}

function collectParts(headers: Map<string, string>, body: string, found: { text: string | null; html: string | null }): void {
  const type = (headers.get('content-type') ?? 'text/plain').toLowerCase();
  if (type.startsWith('multipart/')) {
    const boundary = /boundary="?([^";]+)"?/i.exec(headers.get('content-type') ?? '')?.[1];
    if (!boundary) return;
    const sections = body.split(`--${boundary}`).slice(1);
    for (const section of sections) {
      if (section.startsWith('--')) break;
      const part = splitPart(section.replace(/^\n/, ''));
      collectParts(part.headers, part.body, found);
    }
    return;
  }
  const decoded = decodeBody(body, headers.get('content-transfer-encoding') ?? '7bit');
  if (type.startsWith('text/html')) found.html ??= decoded;
  else if (type.startsWith('text/plain')) found.text ??= decoded;
}

function decodeBody(body: string, encoding: string): string {
  const enc = encoding.toLowerCase();
  if (enc === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  if (enc === 'quoted-printable') return decodeQuotedPrintable(body);
  return body.replace(/\n$/, '');
}

function decodeQuotedPrintable(body: string): string {
  const joined = body.replace(/=\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < joined.length; i++) {
    const ch = joined[i]!;
    const hex = joined.slice(i + 1, i + 3);
    if (ch === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(Number.parseInt(hex, 16));
      i += 2;
    } else {
      for (const b of Buffer.from(ch, 'utf8')) bytes.push(b);
    }
  }
  return Buffer.from(bytes).toString('utf8').replace(/\n$/, '');
}

/** RFC 2047 encoded words: =?charset?B|Q?text?= */
function decodeWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (_m, _charset: string, kind: string, text: string) =>
      kind.toUpperCase() === 'B'
        ? Buffer.from(text, 'base64').toString('utf8')
        : decodeQuotedPrintable(text.replace(/_/g, ' ')),
    );
}
