import { afterEach, describe, expect, it, vi } from 'vitest';
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

/** The tags and attributes of rendered HTML, without its text. */
function markupOf(html: string): string {
  const probe = document.createElement('template');
  probe.innerHTML = html;
  return Array.from(probe.content.querySelectorAll('*'), (el) =>
    [`<${el.tagName.toLowerCase()}`, ...Array.from(el.attributes, (a) => `${a.name}="${a.value}"`)].join(' '),
  ).join('\n');
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
    // Raw HTML comes out as text (&lt;img ... onerror=...): only the markup itself must be clean.
    expect(markupOf(renderMarkdown(source))).not.toMatch(forbidden);
  });

  describe('raw HTML', () => {
    afterEach(() => vi.restoreAllMocks());

    /** Every element with an on* attribute in what DOMPurify hands to its (inert) parser. */
    function handlersParsed(source: string): string[] {
      const parse = vi.spyOn(DOMParser.prototype, 'parseFromString');
      renderMarkdown(source);
      const found: string[] = [];
      for (const [markup] of parse.mock.calls) {
        const probe = document.createElement('template');
        // Counted in happy-dom, which runs no handlers: Chromium reports each one to the page's CSP.
        probe.innerHTML = markup as string;
        for (const el of probe.content.querySelectorAll('*')) {
          for (const a of Array.from(el.attributes)) if (/^on/i.test(a.name)) found.push(`${el.tagName} ${a.name}`);
        }
      }
      return found;
    }

    it.each([
      ['an image with onerror', '<img src=x onerror="alert(1)">'],
      ['an svg with onload', '<svg onload="alert(1)"><circle r=5 /></svg>'],
      ['details with ontoggle', '<details open ontoggle="alert(1)">x</details>'],
      ['a quote-breaking tag', '"><img src=x onerror=alert(1)>'],
      ['an unclosed tag after a raw-text tag', 'a <kbd>b</kbd> <img src=x onerror=alert(1) \n\nnext'],
      ['an unclosed tag after a script tag', '<script>x <img src=x onerror=alert(1) \n'],
      ['a block of HTML', '<div onclick="alert(1)">\n<b onmouseover=alert(1)>x</b>\n</div>'],
    ])('never lets %s reach a parser as markup', (_, source) => {
      expect(handlersParsed(source)).toEqual([]);
    });

    it('is shown as the text it is', () => {
      const html = renderMarkdown('Before <img src=x onerror=alert(1)> after');
      expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;');
      expect(html).not.toMatch(/<img/i);
    });

    it('keeps bare formatting tags', () => {
      expect(renderMarkdown('Drift 0.2 W/m<sup>2</sup>, press <kbd>Esc</kbd>')).toContain('W/m<sup>2</sup>, press <kbd>Esc</kbd>');
      // With an attribute it is no longer bare: shown as text.
      expect(renderMarkdown('<sup class="x">2</sup>')).toContain('&lt;sup class=');
    });
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
