import { describe, expect, it } from 'vitest';
import { chartSvg, isPlainSvg, vegaSvg } from '../../../server/engine/chart-svg.js';
import { compactSvg, MOST_COPIES, roundNumbers } from '../../../server/engine/compact-svg.js';

/** A point chart of `n` rows, as the agreement preset draws it (filled, see-through points). */
const points = (n: number, opacity = 0.4) => ({
  width: 'container',
  title: 'Agreement',
  data: { values: Array.from({ length: n }, (_, i) => ({ mean: 100 + i * 0.37, diff: Math.sin(i) * 10 + i / 7, device: i % 2 === 0 ? 'Left' : 'Right' })) },
  mark: { type: 'point', filled: true, size: 8, opacity },
  encoding: {
    x: { field: 'mean', type: 'quantitative', title: 'Mean of both (W)' },
    y: { field: 'diff', type: 'quantitative', title: 'Difference (W)' },
    color: { field: 'device', type: 'nominal' },
  },
});

/** Centres of the round points vega draws (`<path aria-hidden="true" transform="translate(x,y)" d="M r,0A…">`; legend symbols are not hidden), in order. */
function vegaCentres(svg: string): [number, number][] {
  return [...svg.matchAll(/<path aria-hidden="true" transform="translate\(([-\d.e]+),([-\d.e]+)\)" d="M[\d.]+,0A[^"]*"/g)].map((m) => [Number(m[1]), Number(m[2])]);
}
/** Centres of the circles of the chart's point marks (not its legend's). */
function circleCentres(svg: string): [number, number][] {
  const marks = /<g class="mark-symbol role-mark[^>]*>(.*?)<\/g>/.exec(svg)?.[1] ?? '';
  return [...marks.matchAll(/<circle cx="([-\d.]+)" cy="([-\d.]+)"/g)].map((m) => [Number(m[1]), Number(m[2])]);
}

describe('compact chart drawings', () => {
  it('draws a point chart of N points with N marks, at most 60 bytes a point, each within 0.05 px of where vega puts it', async () => {
    const n = 2000;
    const raw = await vegaSvg(points(n));
    const drawn = await chartSvg(points(n));
    const before = vegaCentres(raw);
    const after = circleCentres(drawn);
    expect(before).toHaveLength(n);
    expect(after).toHaveLength(n);
    for (let i = 0; i < n; i++) {
      expect(Math.abs(after[i]![0] - before[i]![0])).toBeLessThanOrEqual(0.05);
      expect(Math.abs(after[i]![1] - before[i]![1])).toBeLessThanOrEqual(0.05);
    }
    // The frame (axes, title, legend) costs the same as the small chart's; the points cost little each.
    const frame = (await chartSvg(points(2))).length;
    expect((drawn.length - frame) / n).toBeLessThan(60);
    expect(raw.length / drawn.length).toBeGreaterThan(3);
    expect(isPlainSvg(drawn)).toBe(true);
  });

  it('keeps the look: colour and see-through on the group, the axes, title and legend labels as vega wrote them', async () => {
    const raw = await vegaSvg(points(400));
    const drawn = await chartSvg(points(400));
    // Each colour's points in a group of their own colour, 40% opaque (fill-opacity is opacity for a filled shape).
    const groups = [...drawn.matchAll(/<g class="mark-symbol role-mark[^"]*"[^>]*>/g)].map((m) => m[0]);
    expect(groups).toHaveLength(1);
    expect(groups[0]).toContain('fill-opacity="0.4"');
    const fills = new Set([...raw.matchAll(/<path[^>]*d="M[\d.]+,0A[^"]*" fill="(#\w+)"/g)].map((m) => m[1]));
    expect(fills.size).toBe(2);
    // Two colours do not share one group attribute: each circle keeps its own fill.
    for (const fill of fills) expect(drawn.includes(`r="1.41" fill="${fill}"/>`), fill).toBe(true);
    expect(/<g class="mark-symbol role-mark[^>]*>(?:(?!<\/g>).)*<circle[^>]* opacity=/.test(drawn)).toBe(false);
    for (const label of raw.match(/aria-label="[^"]*"/g)!) expect(drawn).toContain(label);
    expect(drawn).toContain('>Agreement</text>');
    expect(drawn).toMatch(/^<svg[^>]* width="816"[^>]* viewBox="0 0 816 \d+"/);
  });

  it('writes coordinates with two decimals at most and leaves text alone', () => {
    expect(roundNumbers('translate(47.14821428571429,124.58333333333333) rotate(270)')).toBe('translate(47.15,124.58) rotate(270)');
    expect(roundNumbers('M0.049,156L-0.0049,60.667L1e-7,3')).toBe('M0.05,156L0,60.67L0,3');
    const svg = '<svg class="marks" width="10" height="10" viewBox="0 0 10 10"><g><text transform="translate(1.23456,2)" aria-label="1.23456">1.23456</text></g></svg>';
    expect(compactSvg(svg)).toBe('<svg class="marks" width="10" height="10" viewBox="0 0 10 10"><g><text transform="translate(1.23,2)" aria-label="1.23456">1.23456</text></g></svg>');
  });

  it(`keeps ${MOST_COPIES} of a run of identical hidden marks drawn over each other, and every labelled one`, () => {
    const line = '<line transform="translate(777,234)" x2="-777" y2="0" stroke="#666"/>';
    const svg = `<svg class="marks" width="10" height="10"><g aria-hidden="true">${line.repeat(500)}</g><g>${'<line aria-label="limit" x2="5" stroke="#666"/>'.repeat(40)}</g></svg>`;
    const out = compactSvg(svg);
    expect(out.match(/x2="-777"/g)).toHaveLength(MOST_COPIES);
    expect(out.match(/aria-label="limit"/g)).toHaveLength(40);
    // Runs only: a different mark between two copies starts a new run.
    const mixed = `<svg class="marks" width="10" height="10"><g aria-hidden="true">${line.repeat(20)}<line x2="1" stroke="#000"/>${line.repeat(20)}</g></svg>`;
    expect(compactSvg(mixed).match(/x2="-777"/g)).toHaveLength(2 * MOST_COPIES);
  });

  it('leaves a drawing it cannot read as it is', () => {
    for (const odd of ['<svg><g></svg>', '<svg><!-- note --></svg>', '<svg><g disabled></g></svg>', 'not svg', '<svg></svg><svg></svg>']) {
      expect(compactSvg(odd)).toBe(odd);
    }
  });
});

describe('what screen readers get from a compact drawing', () => {
  it('hides a group vega calls a symbol but leaves unnamed (a layer drawn from constants, such as a zero line), and keeps every named one', async () => {
    const spec = {
      width: 'container',
      data: { values: [{ gear: '34T', diff: 1.5 }, { gear: '50T', diff: -0.5 }] },
      layer: [
        { mark: { type: 'rule', color: '#666666' }, encoding: { y: { datum: 0 } } },
        { mark: 'bar', encoding: { x: { field: 'gear', type: 'nominal' }, y: { field: 'diff', type: 'quantitative' } } },
      ],
    };
    const raw = await vegaSvg(spec);
    // What vega writes: a container announced as a symbol, with no name.
    expect(raw).toMatch(/<g class="mark-rule role-mark[^"]*" role="graphics-symbol" aria-roledescription="rule mark container">/);
    const drawn = await chartSvg(spec);
    expect(drawn).toMatch(/<g class="mark-rule role-mark[^"]*" aria-hidden="true"/);
    expect(drawn).not.toMatch(/<g(?![^>]*aria-label)[^>]*role="graphics-symbol"/);
    // The bars keep their names.
    expect((drawn.match(/role="graphics-symbol" aria-roledescription="bar"/g) ?? []).length).toBe(2);
  });
});
