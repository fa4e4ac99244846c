import type { EngineErrorData } from '../errors.js';
import type { TopLevelSpec } from './spec.js';

/** Keys of which a vega-lite spec needs at least one at its top. */
const VIEW_KEYS = ['mark', 'layer', 'concat', 'hconcat', 'vconcat', 'facet', 'repeat'];
const MAX_DEPTH = 30;
const MAX_KEYS = 20_000;

/**
 * Checks a hand-written (advanced mode) spec before it is embedded: a JSON object that
 * looks like vega-lite (has a mark, layer, concat, facet or repeat), with no data
 * loaded from URLs (the chart may only show the notebook's own data) and nothing that
 * is not plain JSON. Expressions are allowed: they run through vega's interpreter,
 * never through eval.
 *
 * @example validateUserSpec({ mark: 'point', data: { url: 'https://x/y.csv' } }).ok // false
 */
export function validateUserSpec(spec: unknown): { ok: true; spec: TopLevelSpec } | { ok: false; error: EngineErrorData } {
  const fail = (message: string, field?: string) => ({
    ok: false as const,
    error: { code: 'chart_spec_invalid', message, ...(field ? { where: { field } } : {}) },
  });
  if (typeof spec !== 'object' || spec === null || Array.isArray(spec)) return fail('a chart spec must be a JSON object');
  if (!VIEW_KEYS.some((k) => k in spec)) return fail(`a chart spec needs one of ${VIEW_KEYS.join(', ')}`);
  let keys = 0;
  const walk = (v: unknown, path: string, depth: number): string | undefined => {
    if (depth > MAX_DEPTH) return `spec nests deeper than ${MAX_DEPTH} levels at ${path}`;
    if (v === null || typeof v === 'string' || typeof v === 'boolean') return undefined;
    if (typeof v === 'number') return Number.isFinite(v) ? undefined : `${path} is not a finite number`;
    if (typeof v !== 'object') return `${path} is a ${typeof v}; only JSON values are allowed`;
    const proto = Object.getPrototypeOf(v);
    if (!Array.isArray(v) && proto !== Object.prototype && proto !== null) return `${path} is not plain JSON`;
    for (const [k, x] of Object.entries(v)) {
      if (++keys > MAX_KEYS) return 'spec is too large';
      if (k === '__proto__' || k === 'constructor' || k === 'prototype') return `${path}.${k} is not allowed`;
      if (k === 'url' || k === 'href') return `${path}.${k}: charts show the notebook's data only, not files or links from elsewhere`;
      const problem = walk(x, `${path}.${k}`, depth + 1);
      if (problem) return problem;
    }
    return undefined;
  };
  const problem = walk(spec, 'spec', 0);
  if (problem) return fail(problem);
  return { ok: true, spec: spec as TopLevelSpec };
}
