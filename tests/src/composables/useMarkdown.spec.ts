import { describe, expect, it } from 'vitest';
import { ref } from 'vue';
import { renderMarkdown, useMarkdown } from '@/composables/useMarkdown';

// happy-dom 21 defines nodeName and nodeType on the element classes and leaves the getters
// on Node.prototype answering '' for elements. DOMPurify reads the Node.prototype getters
// (as the DOM standard allows), so under happy-dom it would see no tag names and let
// everything through. Browsers follow the standard; this restores it for the test DOM
// before the first render creates the purifier.
for (const prop of ['nodeName', 'nodeType'] as const) {
  const base = Object.getOwnPropertyDescriptor(Node.prototype, prop)!.get!;
  Object.defineProperty(Node.prototype, prop, {
    configurable: true,
    get(this: Node) {
      for (let p = Object.getPrototypeOf(this); p && p !== Node.prototype; p = Object.getPrototypeOf(p)) {
        const own = Object.getOwnPropertyDescriptor(p, prop);
        if (own?.get) return own.get.call(this);
      }
      return base.call(this);
    },
  });
}

describe('renderMarkdown', () => {
  it('renders Markdown', () => {
    const html = renderMarkdown('# Findings\n\nLeft leg reads **+2.1%** on the large chainring.\n\n| Block | Diff |\n|---|---|\n| 1 | 0.4 |');
    expect(html).toContain('<h1>Findings</h1>');
    expect(html).toContain('<strong>+2.1%</strong>');
    expect(html).toContain('<table>');
  });

  it.each([
    ['a script tag', '<script>alert(1)</script>ok', /<script/i],
    ['an event handler', '<img src="x.png" onerror="alert(1)">', /onerror/i],
    ['a javascript: link', '[click](javascript:alert(1))', /javascript:/i],
    ['a javascript: link in HTML', '<a href="JaVaScRiPt:alert(1)">x</a>', /javascript:/i],
    ['a data: link', '<a href="data:text/html,<script>alert(1)</script>">x</a>', /data:text/i],
    ['an iframe', '<iframe srcdoc="x"></iframe>', /<iframe/i],
    ['a form', '<form action="https://example.org">Send</form>', /<form/i],
    ['an input', '<input name="p" value="secret">', /<input/i],
    ['inline style', '<p style="background:url(javascript:alert(1))">x</p>', /style=/i],
    ['an svg with script', '<svg><script>alert(1)</script></svg>', /<svg|<script/i],
  ])('removes %s', (_, source, forbidden) => {
    expect(renderMarkdown(source)).not.toMatch(forbidden);
  });

  it('keeps ordinary links and makes them open safely', () => {
    const html = renderMarkdown('[method](https://example.org/method)');
    expect(html).toContain('href="https://example.org/method"');
    expect(html).toContain('rel="noopener noreferrer nofollow"');
  });
});

describe('useMarkdown', () => {
  it('follows its source', () => {
    const source = ref('*one*');
    const html = useMarkdown(source);
    expect(html.value).toContain('<em>one</em>');
    source.value = '*two*';
    expect(html.value).toContain('<em>two</em>');
  });
});
