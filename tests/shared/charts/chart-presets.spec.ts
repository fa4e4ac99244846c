import * as ss from 'simple-statistics';
import { parse as parseVega, View } from 'vega';
import { compile } from 'vega-lite';
import { describe, expect, it } from 'vitest';
import {
  LEG_COLOURS,
  TOLERANCE_BAND_COLOUR,
  barsToleranceSpec,
  blandAltmanSpec,
  deviceColour,
  differenceSpec,
  leftRightSpec,
  scatterIdentitySpec,
  tracesSpec,
  type TopLevelSpec,
} from '../../../shared/charts/index.js';

type Layer = { mark: { type: string; color?: string } | string; encoding?: Record<string, Record<string, unknown>>; data?: { values: Record<string, unknown>[] } };
const layers = (s: TopLevelSpec) => (s as unknown as { layer: Layer[] }).layer;
const markType = (l: Layer) => (typeof l.mark === 'string' ? l.mark : l.mark.type);
const rows = (s: TopLevelSpec) => (s as unknown as { data: { values: Record<string, unknown>[] } }).data.values;

const ref = [150, 200, 250, 300, 350, 400];
const test = [153, 203, 256, 305, 358, 409];
const time = [0, 1, 2, 3, 4, 5];

describe('chart presets', () => {
  it('traces: one line per device, each in its slot colour whatever the series order', () => {
    const a = tracesSpec({ timeS: time, series: [{ label: 'Reference', colourIndex: 0, values: ref }, { label: 'Crank', colourIndex: 1, values: test }] });
    const b = tracesSpec({ timeS: time, series: [{ label: 'Crank', colourIndex: 1, values: test }] });
    const enc = (s: TopLevelSpec) => (s as unknown as { encoding: { color: { scale: { domain: string[]; range: string[] } } } }).encoding.color.scale;
    expect((a as { mark: { type: string } }).mark.type).toBe('line');
    expect(enc(a)).toEqual({ domain: ['Reference', 'Crank'], range: [deviceColour(0), deviceColour(1)] });
    expect(enc(b)).toEqual({ domain: ['Crank'], range: [deviceColour(1)] });
    expect(rows(a)).toHaveLength(12);
  });

  it('traces: missing samples become null, not NaN (JSON has no NaN)', () => {
    const s = tracesSpec({ timeS: [0, 1], series: [{ label: 'R', colourIndex: 0, values: [NaN, 100] }] });
    expect(rows(s)[0]!['value']).toBeNull();
    expect(() => JSON.parse(JSON.stringify(s))).not.toThrow();
  });

  it('difference: test - reference over time with a zero rule', () => {
    const s = differenceSpec({ timeS: time, test, reference: ref, device: { label: 'Crank', colourIndex: 1 } });
    expect(layers(s).map(markType)).toEqual(['rule', 'line']);
    expect(rows(s).map((r) => r['diff'])).toEqual(test.map((t, i) => t - ref[i]!));
    expect((layers(s)[1]!.mark as { color: string }).color).toBe(deviceColour(1));
    const pct = differenceSpec({ timeS: time, test, reference: ref, device: { label: 'Crank', colourIndex: 1 }, percent: true });
    expect(rows(pct)[0]!['diff']).toBeCloseTo(2, 12); // 153 vs 150 is +2%
  });

  it('scatter: points, identity line and least-squares line', () => {
    const s = scatterIdentitySpec({ reference: ref, test, device: { label: 'Crank', colourIndex: 1 } });
    const [points, identity, fit] = layers(s);
    expect([points, identity, fit].map((l) => markType(l!))).toEqual(['point', 'line', 'line']);
    expect(identity!.data!.values.every((r) => r['ref'] === r['test'])).toBe(true);
    const expected = ss.linearRegression(ref.map((r, i) => [r, test[i]!]));
    const [p0, p1] = fit!.data!.values as { ref: number; test: number }[];
    expect((p1!.test - p0!.test) / (p1!.ref - p0!.ref)).toBeCloseTo(expected.m, 10);
  });

  it('bland-altman: bias and both limits of agreement as rules', () => {
    const s = blandAltmanSpec({ reference: ref, test, device: { label: 'Crank', colourIndex: 1 } });
    const [points, rules] = layers(s);
    expect(markType(points!)).toBe('point');
    expect(markType(rules!)).toBe('rule');
    const d = test.map((t, i) => t - ref[i]!);
    const byName = Object.fromEntries(rules!.data!.values.map((r) => [r['line'], r['value']]));
    // Bland & Altman 1986: bias = mean difference, limits = bias +/- 1.96 SD.
    expect(byName['bias']).toBeCloseTo(ss.mean(d), 12);
    expect(byName['lower limit']).toBeCloseTo(ss.mean(d) - 1.96 * ss.sampleStandardDeviation(d), 10);
    expect(byName['upper limit']).toBeCloseTo(ss.mean(d) + 1.96 * ss.sampleStandardDeviation(d), 10);
    expect(points!.data!.values[0]).toEqual({ mean: 151.5, diff: 3 });
  });

  it('bars with tolerance: a grey band at +/- tolerance under the bars, bars outside marked', () => {
    const s = barsToleranceSpec({
      bars: [{ label: 'Block 1', valuePct: 0.8, group: 'Crank' }, { label: 'Block 2', valuePct: -2.6, group: 'Crank' }, { label: 'Block 1', valuePct: 0.2, group: 'Pedals' }],
      tolerancePct: 2,
      devices: [{ label: 'Crank', colourIndex: 1 }, { label: 'Pedals', colourIndex: 2 }],
    });
    const [band, zero, bars] = layers(s);
    expect(markType(band!)).toBe('rect');
    expect((band!.mark as { color: string }).color).toBe(TOLERANCE_BAND_COLOUR);
    expect(band!.encoding).toEqual({ y: { datum: -2 }, y2: { datum: 2 } });
    expect(markType(zero!)).toBe('rule');
    expect(markType(bars!)).toBe('bar');
    expect(bars!.encoding!['color']!['scale']).toEqual({ domain: ['Crank', 'Pedals'], range: [deviceColour(1), deviceColour(2)] });
    expect(rows(s).map((r) => r['outside'])).toEqual([false, true, false]);
  });

  it('left-right: both legs per label in fixed leg colours over the band', () => {
    const s = leftRightSpec({ labels: ['34T', '50T'], leftPct: [0.4, 3.1], rightPct: [0.2, 0.3], tolerancePct: 1.5 });
    const [band, , bars] = layers(s);
    expect(band!.encoding).toEqual({ y: { datum: -1.5 }, y2: { datum: 1.5 } });
    expect(bars!.encoding!['color']!['scale']).toEqual({ domain: ['left', 'right'], range: [LEG_COLOURS.left, LEG_COLOURS.right] });
    expect(rows(s)).toEqual([
      { label: '34T', leg: 'left', value: 0.4 },
      { label: '34T', leg: 'right', value: 0.2 },
      { label: '50T', leg: 'left', value: 3.1 },
      { label: '50T', leg: 'right', value: 0.3 },
    ]);
  });

  it('every preset is plain JSON with the vega-lite schema', () => {
    const specs = [
      tracesSpec({ timeS: time, series: [{ label: 'R', colourIndex: 0, values: ref }] }),
      differenceSpec({ timeS: time, test, reference: ref, device: { label: 'C', colourIndex: 1 } }),
      scatterIdentitySpec({ reference: ref, test, device: { label: 'C', colourIndex: 1 } }),
      blandAltmanSpec({ reference: ref, test, device: { label: 'C', colourIndex: 1 } }),
      barsToleranceSpec({ bars: [{ label: 'a', valuePct: 1 }], tolerancePct: 2 }),
      leftRightSpec({ labels: ['a'], leftPct: [1], rightPct: [1], tolerancePct: 2 }),
    ];
    for (const s of specs) {
      expect(s.$schema).toMatch(/vega-lite\/v6/);
      expect(JSON.parse(JSON.stringify(s))).toEqual(s);
    }
  });

  it('draws a rule at zero and a tolerance band once, however many rows the chart has', async () => {
    const n = 500;
    const t = Array.from({ length: n }, (_, i) => i);
    const r = t.map((i) => 200 + (i % 40));
    const d = r.map((v, i) => v + (i % 7) - 3);
    const bars = Array.from({ length: 40 }, (_, i) => ({ label: `b${i}`, valuePct: (i % 9) - 4 }));
    const legs = Array.from({ length: 40 }, (_, i) => `l${i}`);
    // The mark types each preset draws once (the rest draw from the rows).
    const cases: [TopLevelSpec, string[]][] = [
      [differenceSpec({ timeS: t, test: d, reference: r, device: { label: 'C', colourIndex: 1 } }), ['rule']],
      [barsToleranceSpec({ bars, tolerancePct: 2 }), ['rule', 'rect']],
      [leftRightSpec({ labels: legs, leftPct: legs.map((_, i) => i % 3), rightPct: legs.map((_, i) => -(i % 3)), tolerancePct: 2 }), ['rule', 'rect']],
    ];
    for (const [spec, once] of cases) {
      // Drawn by the chart library itself: the marks each layer puts on the page.
      const view = new View(parseVega(compile(spec as never).spec), { renderer: 'none' });
      await view.runAsync();
      // Items per mark, by the name vega-lite gives each layer's marks.
      const counts = new Map<string, number>();
      const walk = (node: { items?: unknown[]; marktype?: string; role?: string; name?: string }): void => {
        if (node.marktype && node.role === 'mark' && node.name) counts.set(node.name, (counts.get(node.name) ?? 0) + (node.items?.length ?? 0));
        for (const child of node.items ?? []) walk(child as typeof node);
      };
      walk((view.scenegraph() as unknown as { root: Parameters<typeof walk>[0] }).root);
      view.finalize();
      const drawn = layers(spec).map((l, i) => [markType(l), counts.get(`layer_${i}_marks`)] as const);
      for (const [type, items] of drawn) if (once.includes(type)) expect(items, `${type} marks`).toBe(1);
      // The data layer still draws from every row.
      expect(drawn.some(([type, items]) => !once.includes(type) && (items ?? 0) >= 1)).toBe(true);
    }
  });
});
