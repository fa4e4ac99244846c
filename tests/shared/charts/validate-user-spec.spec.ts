import { describe, expect, it } from 'vitest';
import { validateUserSpec } from '../../../shared/charts/index.js';

describe('validateUserSpec', () => {
  it('accepts a plain vega-lite spec, expressions included', () => {
    const spec = { mark: 'point', encoding: { x: { field: 'ref' } }, transform: [{ calculate: 'datum.test - datum.ref', as: 'd' }] };
    expect(validateUserSpec(spec)).toEqual({ ok: true, spec });
    expect(validateUserSpec({ layer: [] }).ok).toBe(true);
  });

  it.each([
    ['not an object', 'point'],
    ['an array', [{ mark: 'point' }]],
    ['no view', { encoding: {} }],
    ['data from a URL', { mark: 'point', data: { url: 'https://example.org/x.csv' } }],
    ['a nested URL', { layer: [{ mark: 'image', encoding: { url: { field: 'u' } } }] }],
    ['a link', { mark: 'point', encoding: { href: { field: 'u' } } }],
    ['a prototype key', JSON.parse('{"mark":"point","__proto__":{"x":1}}')],
    ['a function', { mark: 'point', encoding: { x: () => 1 } }],
  ])('refuses %s', (_, spec) => {
    const r = validateUserSpec(spec);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.error.code).toBe('chart_spec_invalid');
  });
});
