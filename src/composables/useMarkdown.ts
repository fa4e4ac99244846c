import DOMPurify from 'dompurify';
import { Marked } from 'marked';
import { computed, toValue, type ComputedRef, type MaybeRefOrGetter } from 'vue';

const marked = new Marked({ gfm: true, breaks: false });

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
 * Markdown of a note cell as safe HTML: rendered by marked, then sanitised by DOMPurify
 * (no scripts, no event handlers, no javascript: or data: links, no forms, frames or
 * inline styles).
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
