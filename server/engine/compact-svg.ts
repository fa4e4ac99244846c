/**
 * Makes vega's SVG drawing of a chart smaller without changing how it looks, so a published
 * page with a chart of thousands of points parses, lays out and paints quickly:
 * - coordinates are written with at most {@link DECIMALS} decimals (vega writes up to 16);
 * - the attributes every mark of a group shares (colour, opacity, stroke width) are written
 *   once on the group instead of on each mark (they are inherited);
 * - a round point (vega's circle symbol, a path moved into place) becomes a `<circle>`;
 * - marks that are the very same drawing, one right over the other, are kept
 *   {@link MOST_COPIES} times: past that many copies a pixel no longer changes.
 * Titles, text and the labels screen readers read (aria-*) are kept as they are, but for one
 * thing: a group of marks vega calls a symbol without giving it a name (a layer drawn from
 * constants alone, such as a zero line or a shaded band) is hidden from screen readers, which
 * would otherwise announce an unnamed picture.
 */

/** Decimals kept in coordinates: positions move by at most 0.005 px. */
export const DECIMALS = 2;
/**
 * Identical marks drawn over each other that are kept. Each copy of a half-covered edge pixel
 * or of a 40% opaque point covers what is left by half or 40%: after 16 copies less than 1/255
 * of the colour is left to change, so the pixels are those of any larger number of copies.
 */
export const MOST_COPIES = 16;

/** Attributes whose numbers are coordinates or lengths (rounded). */
const GEOMETRY = new Set(['d', 'transform', 'x', 'y', 'x1', 'x2', 'y1', 'y2', 'width', 'height', 'r', 'cx', 'cy', 'rx', 'ry', 'points']);
/** Attributes a child inherits from its group, so one copy on the group serves every mark. */
const INHERITED = new Set(['fill', 'fill-opacity', 'stroke', 'stroke-width', 'stroke-opacity', 'stroke-dasharray', 'stroke-dashoffset', 'stroke-linecap', 'stroke-linejoin', 'stroke-miterlimit', 'fill-rule']);

interface Element {
  name: string;
  attrs: [string, string][];
  /** Child elements and text (text kept exactly as vega escaped it). */
  children: (Element | string)[];
  /** Written as `<name/>` (no children, no closing tag). */
  empty: boolean;
}

const NUMBER = /-?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?/g;

/**
 * The compact form of an SVG document as vega's SVG renderer writes it. Anything it does not
 * understand (a tag left open, a comment, a closing tag that matches nothing) makes it return
 * the drawing unchanged.
 */
export function compactSvg(svg: string): string {
  const root = parse(svg);
  if (!root) return svg;
  compactElement(root, new Map());
  return write(root);
}

function parse(svg: string): Element | undefined {
  const top: Element = { name: '#top', attrs: [], children: [], empty: false };
  const stack: Element[] = [top];
  const n = svg.length;
  let at = 0;
  while (at < n) {
    const open = svg.indexOf('<', at);
    const text = svg.slice(at, open < 0 ? n : open);
    if (text.includes('>')) return undefined;
    if (text !== '') stack[stack.length - 1]!.children.push(text);
    if (open < 0) break;
    let i = open + 1;
    const closing = svg.charCodeAt(i) === 47; // '/'
    if (closing) i++;
    const nameStart = i;
    while (i < n && isNameChar(svg.charCodeAt(i))) i++;
    const name = svg.slice(nameStart, i);
    if (name === '' || !/^[A-Za-z]/.test(name)) return undefined; // a comment, declaration or stray '<'
    if (closing) {
      if (svg.charCodeAt(i) !== 62 || stack.length < 2 || stack[stack.length - 1]!.name !== name) return undefined;
      stack.pop();
      at = i + 1;
      continue;
    }
    const attrs: [string, string][] = [];
    let empty = false;
    for (;;) {
      while (i < n && isSpace(svg.charCodeAt(i))) i++;
      const c = svg.charCodeAt(i);
      if (c === 62) { i++; break; } // '>'
      if (c === 47 && svg.charCodeAt(i + 1) === 62) { empty = true; i += 2; break; } // '/>'
      const attrStart = i;
      while (i < n && isNameChar(svg.charCodeAt(i))) i++;
      // Only name="value" pairs, as vega writes them.
      if (i === attrStart || svg.charCodeAt(i) !== 61 || svg.charCodeAt(i + 1) !== 34) return undefined;
      const valueEnd = svg.indexOf('"', i + 2);
      if (valueEnd < 0) return undefined;
      const value = svg.slice(i + 2, valueEnd);
      if (value.includes('<') || value.includes('>')) return undefined;
      attrs.push([svg.slice(attrStart, i), value]);
      i = valueEnd + 1;
    }
    const element: Element = { name, attrs, children: [], empty };
    stack[stack.length - 1]!.children.push(element);
    if (!empty) stack.push(element);
    at = i;
  }
  const [root] = top.children;
  return stack.length === 1 && top.children.length === 1 && typeof root === 'object' && root.name === 'svg' ? root : undefined;
}

/** Letters, digits and `:_-.` (names of tags and attributes). */
function isNameChar(c: number): boolean {
  return (c >= 97 && c <= 122) || (c >= 65 && c <= 90) || (c >= 48 && c <= 57) || c === 58 || c === 95 || c === 45 || c === 46;
}
function isSpace(c: number): boolean {
  return c === 32 || c === 10 || c === 9 || c === 13;
}

function write(e: Element): string {
  const out: string[] = [];
  writeTo(e, out);
  return out.join('');
}
function writeTo(e: Element, out: string[]): void {
  out.push('<', e.name);
  for (const [k, v] of e.attrs) out.push(' ', k, '="', v, '"');
  if (e.empty) {
    out.push('/>');
    return;
  }
  out.push('>');
  for (const c of e.children) {
    if (typeof c === 'string') out.push(c);
    else writeTo(c, out);
  }
  out.push('</', e.name, '>');
}

/** `value` with every number of more than {@link DECIMALS} decimals rounded. */
export function roundNumbers(value: string): string {
  return value.replace(NUMBER, (n) => {
    if (!/[.eE]/.test(n)) return n;
    const x = Number(n);
    if (!Number.isFinite(x)) return n;
    const rounded = String(Math.round(x * 10 ** DECIMALS) / 10 ** DECIMALS);
    // Never longer than what vega wrote (a short number may look shorter in another form).
    return rounded.length <= n.length ? (rounded === '-0' ? '0' : rounded) : n;
  });
}

function get(e: Element, name: string): string | undefined {
  return e.attrs.find(([k]) => k === name)?.[1];
}

/**
 * Compacts `e` and its children; `inherited` holds the inheritable attributes its ancestors
 * set (what a child without its own value draws with).
 */
function compactElement(e: Element, inherited: Map<string, string>): void {
  for (const a of e.attrs) if (GEOMETRY.has(a[0])) a[1] = roundNumbers(a[1]);
  if (e.name === 'g' && get(e, 'role') === 'graphics-symbol' && get(e, 'aria-label') === undefined && get(e, 'aria-labelledby') === undefined) {
    e.attrs = e.attrs.filter(([k]) => k !== 'role' && k !== 'aria-roledescription');
    e.attrs.push(['aria-hidden', 'true']);
  }
  const own = new Map(inherited);
  for (const [k, v] of e.attrs) if (INHERITED.has(k)) own.set(k, v);
  if (e.name === 'g') {
    e.children = collapseCopies(e);
    hoistShared(e, own);
  }
  for (const c of e.children) if (typeof c !== 'string') compactElement(c, own);
  if (e.name === 'g') e.children = e.children.map((c) => (typeof c === 'string' ? c : asCircle(c)));
}

/** A mark screen readers are not told about (hidden itself, or inside a hidden group). */
function hidden(e: Element, group: Element): boolean {
  return get(e, 'aria-hidden') === 'true' || get(group, 'aria-hidden') === 'true';
}

/** What tells two childless elements apart. */
function keyOf(e: Element): string {
  let key = e.name;
  for (const [k, v] of e.attrs) key += `\0${k}\0${v}`;
  return key;
}

/** The children of `g` with each run of identical hidden marks cut to {@link MOST_COPIES}. */
function collapseCopies(g: Element): (Element | string)[] {
  const out: (Element | string)[] = [];
  let last = '';
  let run = 0;
  for (const c of g.children) {
    const same = typeof c !== 'string' && c.empty && hidden(c, g) ? keyOf(c) : undefined;
    if (same !== undefined && same === last) {
      if (++run > MOST_COPIES) continue;
    } else {
      last = same ?? '';
      run = 1;
    }
    out.push(c);
  }
  return out;
}

/**
 * Writes once on a mark group what all its marks share: inheritable attributes, and the
 * opacity of marks that are only filled (as fill-opacity, which is the same for one shape).
 * Only for groups of two or more childless marks of one kind (marks, ticks, grid lines).
 */
function hoistShared(g: Element, inherited: Map<string, string>): void {
  const marks = g.children.filter((c): c is Element => typeof c !== 'string');
  if (marks.length < 2 || marks.length !== g.children.length || !marks.every((m) => m.empty && m.name === marks[0]!.name)) return;
  const shared = new Map(marks[0]!.attrs);
  for (const m of marks.slice(1)) {
    for (const [k, v] of shared) if (get(m, k) !== v) shared.delete(k);
  }
  const lift = new Map<string, string>();
  for (const [k, v] of shared) if (INHERITED.has(k) && get(g, k) === undefined) lift.set(k, v);
  const stroke = lift.get('stroke') ?? (shared.has('stroke') ? shared.get('stroke') : inherited.get('stroke'));
  const opacity = shared.get('opacity');
  // Only-filled marks: opacity and fill-opacity multiply to the same colour on one shape.
  const filledOnly = (stroke === undefined || stroke === 'none') && marks.every((m) => get(m, 'stroke') === undefined);
  if (opacity !== undefined && filledOnly && get(g, 'fill-opacity') === undefined && !shared.has('fill-opacity') && marks.every((m) => get(m, 'fill-opacity') === undefined)) {
    lift.set('fill-opacity', opacity);
    lift.delete('opacity');
    for (const m of marks) m.attrs = m.attrs.filter(([k]) => k !== 'opacity');
  }
  // Nothing to draw a stroke with: its width is of no use.
  if (filledOnly && lift.has('stroke-width')) lift.delete('stroke-width');
  const dropped = new Set(lift.keys());
  if (filledOnly) dropped.add('stroke-width');
  if (get(g, 'aria-hidden') === 'true' && shared.get('aria-hidden') === 'true') dropped.add('aria-hidden');
  if (dropped.size === 0) return;
  for (const m of marks) m.attrs = m.attrs.filter(([k]) => !dropped.has(k));
  for (const [k, v] of lift) g.attrs.push([k, v]);
}

const CIRCLE = /^M([\d.]+),0A([\d.]+),([\d.]+),0,1,1,-([\d.]+),0A([\d.]+),([\d.]+),0,1,1,([\d.]+),0Z?$/;
const TRANSLATE = /^translate\((-?[\d.]+),(-?[\d.]+)\)$/;

/** Vega's round symbol (a circle path moved into place) as a `<circle>`; any other element as it is. */
function asCircle(e: Element): Element {
  if (e.name !== 'path' || !e.empty) return e;
  const d = get(e, 'd');
  const transform = get(e, 'transform');
  const circle = d === undefined ? null : CIRCLE.exec(d);
  const at = transform === undefined ? null : TRANSLATE.exec(transform);
  if (!circle || !at || circle.slice(2).some((r) => r !== circle[1])) return e;
  const attrs: [string, string][] = [];
  for (const [k, v] of e.attrs) {
    if (k === 'transform') attrs.push(['cx', at[1]!], ['cy', at[2]!]);
    else if (k === 'd') attrs.push(['r', circle[1]!]);
    else attrs.push([k, v]);
  }
  return { name: 'circle', attrs, children: [], empty: true };
}
