import sanitizeHtml from 'sanitize-html';

/**
 * What the published page's server render (src/published-ssr.ts) uses in place of DOMPurify,
 * which needs a browser's DOM: the same two calls useMarkdown makes, done by sanitize-html.
 * Markdown reaches it already with any raw HTML escaped (useMarkdown's renderer); this keeps
 * marked's own tags and their plain attributes, drops every other tag and attribute, keeps
 * only http(s), mailto and tel links, and opens links elsewhere as the browser's hook does.
 */
const OPTIONS: sanitizeHtml.IOptions = {
  allowedTags: [...sanitizeHtml.defaults.allowedTags, 'img', 'del', 'ins', 'kbd', 'mark', 'small', 'sub', 'sup', 'u', 's'],
  allowedAttributes: { a: ['href', 'title', 'target', 'rel'], img: ['src', 'alt', 'title'], th: ['align'], td: ['align'], ol: ['start'], code: ['class'] },
  allowedSchemes: ['http', 'https', 'mailto', 'tel'],
  allowProtocolRelative: false,
  transformTags: {
    a: (tagName, attribs) => ({ tagName, attribs: attribs['href'] ? { ...attribs, target: '_blank', rel: 'noopener noreferrer nofollow' } : attribs }),
  },
};

export default function createPurifier(_window?: unknown) {
  return {
    addHook(): void {
      // Links are opened elsewhere by OPTIONS.transformTags.
    },
    sanitize(html: string): string {
      return sanitizeHtml(html, OPTIONS);
    },
  };
}
