import type { Snapshot } from '../../shared/api/snapshots.js';
import { compactSvg } from './compact-svg.js';
import { EXTRA_CODE_POINTS, PLEX_WIDTHS } from './plex-metrics.js';

/**
 * Width a published page gives its charts, px: the article's 880 px column less its padding.
 * Narrower screens scale the drawing down (it keeps its viewBox).
 */
export const PUBLISHED_CHART_WIDTH = 816;
/** Height of a chart whose spec names none (the browser's chart view uses the same). */
const DEFAULT_HEIGHT = 260;
/** Vega config the browser's chart view embeds with (src/components/ChartView.vue): the same look. */
const CHART_CONFIG = { font: 'IBM Plex Sans, system-ui, sans-serif', view: { stroke: '#E5DFD2' } };

/**
 * Draws every chart of a snapshot as SVG, in place (`result.svg`), so a reader's page shows
 * and prints the charts as soon as it has the snapshot, without loading the chart library.
 * The spec is compiled by vega-lite and run by vega with its expression interpreter (never
 * eval), `width: 'container'` becoming `width` px. A chart that fails to draw, or whose
 * drawing holds anything but plain SVG shapes and text, keeps no `svg`: the page draws that
 * one itself.
 */
export async function drawSnapshotCharts(snapshot: Snapshot, width = PUBLISHED_CHART_WIDTH): Promise<void> {
  for (const cell of snapshot.cells) {
    const result = cell.result;
    if (result?.type !== 'chart') continue;
    const svg = await chartSvg(result.spec, width).catch(() => undefined);
    if (svg !== undefined && isPlainSvg(svg)) result.svg = svg;
  }
}

type Vega = typeof import('vega');
/** A text mark as vega's measurer sees it. */
interface TextItem {
  font?: string;
  fontSize?: number | string | null;
  fontWeight?: string | number;
}
/** vega-scenegraph's text measurer (`vega.textMetrics`). */
interface TextMetrics {
  width: (item: TextItem, text?: string) => number;
  estimateWidth: (item: TextItem, text?: string) => number;
}
let loaded: Promise<{ vega: Vega; compile: typeof import('vega-lite').compile; expr: typeof import('vega-interpreter').expressionInterpreter }> | undefined;

/** vega and vega-lite load on the first chart only (a server that never publishes never loads them). */
function libraries() {
  loaded ??= Promise.all([import('vega'), import('vega-lite'), import('vega-interpreter')]).then(([vega, vl, interpreter]) => {
    // Exported by vega at run time, left out of its type declarations.
    measureWithPlex((vega as unknown as { textMetrics: TextMetrics }).textMetrics);
    return { vega, compile: vl.compile, expr: interpreter.expressionInterpreter };
  });
  return loaded;
}

/** One vega-lite spec as an SVG document string, made compact (see compactSvg). */
export async function chartSvg(spec: Record<string, unknown>, width = PUBLISHED_CHART_WIDTH): Promise<string> {
  return compactSvg(await vegaSvg(spec, width));
}

/** One vega-lite spec as vega's SVG renderer writes it. */
export async function vegaSvg(spec: Record<string, unknown>, width = PUBLISHED_CHART_WIDTH): Promise<string> {
  const { vega, compile, expr } = await libraries();
  const sized: Record<string, unknown> = { height: DEFAULT_HEIGHT, ...spec };
  if (sized['width'] === 'container' || sized['width'] === undefined) {
    sized['width'] = width;
    // What vega-lite does for a container width: the whole drawing, axes included, fits it.
    sized['autosize'] ??= { type: 'fit-x', contains: 'padding' };
  }
  // A label for each of thousands of points helps no one and is most of the drawing's size: a
  // chart of many rows describes its axes, title and legend only (a few bars keep theirs).
  const config = largestDataset(spec) > MANY_ROWS ? { ...CHART_CONFIG, mark: { aria: false } } : CHART_CONFIG;
  const compiled = compile(sized as unknown as Parameters<typeof compile>[0], { config }).spec;
  const view = new vega.View(vega.parse(compiled, undefined, { ast: true }), { renderer: 'none', expr, logLevel: vega.None });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

/** Rows of inline data past which a drawing leaves out the label of each mark. */
const MANY_ROWS = 300;

/** Rows of the largest inline dataset of a vega-lite spec (`data.values` at any depth, `datasets`). */
function largestDataset(spec: unknown): number {
  let most = 0;
  const walk = (node: unknown, depth: number): void => {
    if (depth > 32 || typeof node !== 'object' || node === null) return;
    if (Array.isArray(node)) return node.forEach((x) => walk(x, depth + 1));
    for (const [k, v] of Object.entries(node)) {
      if (k === 'datasets' && typeof v === 'object' && v !== null) {
        for (const rows of Object.values(v)) if (Array.isArray(rows)) most = Math.max(most, rows.length);
      } else if (k === 'values' && Array.isArray(v)) most = Math.max(most, v.length);
      else walk(v, depth + 1);
    }
  };
  walk(spec, 0);
  return most;
}

/** Tags vega's SVG renderer writes for marks, axes, legends and titles. */
const SVG_TAGS = new Set(['svg', 'g', 'path', 'rect', 'line', 'text', 'tspan', 'title', 'desc', 'defs', 'clippath', 'lineargradient', 'radialgradient', 'stop', 'circle', 'ellipse', 'polyline', 'polygon']);
const TAG = /<(\/?)([A-Za-z][\w:-]*)([^>]*)>/g;
const ATTRIBUTE = /([^\s=/]+)(?:\s*=\s*"([^"]*)")?/g;

/**
 * True when the SVG holds only drawing tags with plain attributes: no script, link, image,
 * foreign content, event handler or outside reference. Vega escapes every text and attribute
 * it writes (so a literal `<` always starts one of its tags); this is the second line, as the
 * page puts this markup straight into the document.
 */
export function isPlainSvg(svg: string): boolean {
  if (!svg.startsWith('<svg')) return false;
  for (const [, , name, rest] of svg.matchAll(TAG)) {
    if (!SVG_TAGS.has(name!.toLowerCase())) return false;
    for (const [, attr, value] of rest!.matchAll(ATTRIBUTE)) {
      const a = attr!.toLowerCase();
      if (a.startsWith('on') || a === 'href' || a === 'xlink:href' || a === 'src' || a === 'style') return false;
      if (value !== undefined && /url\((?!#)|javascript:|data:/i.test(value)) return false;
    }
  }
  return true;
}

/**
 * Vega's text measurer, set to IBM Plex Sans' widths for the chart font and left to vega's own
 * guess for any other. It measures the line as given: vega shortens a label to its limit by
 * calling this on ever shorter pieces, so it must not shorten anything itself.
 */
function measureWithPlex(metrics: TextMetrics): void {
  const estimate = metrics.estimateWidth;
  const index = new Map<number, number>();
  for (let c = 0x20; c <= 0x7e; c++) index.set(c, c - 0x20);
  for (let c = 0xa0; c <= 0xff; c++) index.set(c, 95 + c - 0xa0);
  EXTRA_CODE_POINTS.forEach((c, i) => index.set(c, 191 + i));
  const zero = index.get(0x30)!;
  metrics.width = (item, text) => {
    const font = item.font ?? '';
    if (font !== '' && !/plex/i.test(font)) return estimate(item, text);
    const size = item.fontSize !== undefined && item.fontSize !== null ? Number(item.fontSize) || 0 : 11;
    const w = item.fontWeight;
    const weight = w === 'bold' || w === 'bolder' ? 700 : typeof w === 'number' ? w : Number(w) || 400;
    const table = PLEX_WIDTHS[weight >= 600 ? 600 : weight >= 500 ? 500 : 400];
    let sum = 0;
    for (const ch of (text === undefined || text === null ? '' : String(text)).trim()) sum += table[index.get(ch.codePointAt(0)!) ?? zero]!;
    return (sum * size) / 1000;
  };
}
