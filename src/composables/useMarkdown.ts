import DOMPurify from 'dompurify';
import { Marked, type Tokens } from 'marked';
import { computed, toValue, type ComputedRef, type MaybeRefOrGetter } from 'vue';

/**
 * Raw HTML a note may use: a bare formatting tag, opening or closing, with no attributes
 * (W/m<sup>2</sup>, <kbd>Esc</kbd>, a forced <br>). Anything else a writer types between
 * angle brackets is shown as the text it is.
 */
const PLAIN_TAG = /^<\/?(b|i|u|s|em|strong|sub|sup|kbd|mark|small|del|ins|br)\s*\/?>$/i;

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };
const escapeHtml = (text: string): string => text.replace(/[&<>"']/g, (c) => ESCAPES[c]!);

/**
 * Raw HTML never reaches an HTML parser as markup. Chromium checks an inline event handler
 * against the page's Content-Security-Policy the moment any parser tied to the page creates
 * the attribute - DOMPurify's inert DOMParser document and a <template> included - so a
 * planted `onerror` would be reported (and blocked) before the sanitiser could drop it.
 * Escaping it here means the only tags the sanitiser ever parses are marked's own.
 */
const marked = new Marked({
  gfm: true,
  breaks: false,
  renderer: {
    html({ text }: Tokens.HTML | Tokens.Tag): string {
      const tag = text.trim();
      return PLAIN_TAG.test(tag) ? tag.toLowerCase().replace(/\s+/g, '') : escapeHtml(text);
    },
    // After <script>, <pre>, <code> or <kbd> marked passes the following text through raw
    // (flagged `escaped`); those tags are text or plain here, so that text is escaped too.
    text(token: Tokens.Text | Tokens.Escape): string | false {
      return token.type === 'text' && token.escaped === true && !token.tokens ? escapeHtml(token.text) : false;
    },
  },
});

let purifier: ReturnType<typeof DOMPurify> | undefined;

/** A DOMPurify instance of its own, so its link hook does not change other users of the library. */
function getPurifier(): ReturnType<typeof DOMPurify> {
  if (purifier) return purifier;
  purifier = DOMPurify(window);
  purifier.addHook('afterSanitizeAttributes', (node) => {
    // Links in notes open elsewhere and must not give the notebook page to the target.
    if (node.tagName === 'A' && node.hasAttribute('href')) {
      node.setAttribute('target', '_blank');
      node.setAttribute('rel', 'noopener noreferrer nofollow');
    }
  });
  return purifier;
}

/**
 * Markdown of a note cell as safe HTML: rendered by marked with raw HTML shown as text
 * (bare formatting tags excepted), then sanitised by DOMPurify as a second line (no
 * scripts, no event handlers, no javascript: or data: links, no forms, frames or inline
 * styles).
 *
 * @example renderMarkdown('**bias** +0.8%') // '<p><strong>bias</strong> +0.8%</p>\n'
 */
export function renderMarkdown(source: string): string {
  const html = marked.parse(source, { async: false });
  return getPurifier().sanitize(html, {
    USE_PROFILES: { html: true },
    FORBID_TAGS: ['style', 'form', 'input', 'button', 'textarea', 'select', 'iframe', 'object', 'embed', 'svg', 'math'],
    FORBID_ATTR: ['style'],
    ALLOW_DATA_ATTR: false,
  });
}

/** Reactive rendered HTML of a Markdown source (a ref, getter or plain string). */
export function useMarkdown(source: MaybeRefOrGetter<string>): ComputedRef<string> {
  return computed(() => renderMarkdown(toValue(source)));
}
