import { describe, expect, it } from 'vitest';
import createPurifier from '@/components/snapshot/sanitizeOnServer';

// The server's render of a published page sanitises notes with this instead of DOMPurify.
const clean = (html: string) => createPurifier().sanitize(html);

describe('the server render\'s note sanitiser', () => {
  it('keeps what marked writes for a note', () => {
    const html = '<h2>Finding</h2>\n<p>Left reads <strong>+8%</strong> on the <em>50T</em>; W/m<sup>2</sup>, <kbd>Esc</kbd></p>\n<ul>\n<li>one</li>\n</ul>\n<table><thead><tr><th align="right">a</th></tr></thead><tbody><tr><td align="right">1</td></tr></tbody></table>\n<pre><code class="language-text">x &lt; y</code></pre>';
    expect(clean(html)).toBe(html);
  });

  it('opens links elsewhere and drops scripts, handlers, styles, frames and other schemes', () => {
    expect(clean('<a href="https://lab.test/x">x</a>')).toBe('<a href="https://lab.test/x" target="_blank" rel="noopener noreferrer nofollow">x</a>');
    expect(clean('<a href="javascript:alert(1)">x</a>')).toMatch(/^<a[^>]*>x<\/a>$/);
    expect(clean('<a href="javascript:alert(1)">x</a>')).not.toMatch(/href|javascript/);
    expect(clean('<p onclick="alert(1)" style="color:red">y</p>')).toBe('<p>y</p>');
    expect(clean('<img src="https://lab.test/a.png" onerror="alert(1)" alt="a">')).toBe('<img src="https://lab.test/a.png" alt="a" />');
    expect(clean('<script>alert(1)</script><iframe src="https://x.test"></iframe><form><input></form><svg><a href="#">s</a></svg>')).not.toMatch(/script|iframe|form|input|svg/);
  });
});
