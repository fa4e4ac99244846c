import { describe, expect, it } from 'vitest';
import { analyseFormula, evaluateFormula } from '../../../shared/formula/index.js';
import { isEngineError } from '../../../shared/errors.js';
import { hashRecording } from '../../../shared/notebook/hash.js';
import type { Recording } from '../../../shared/recording/recording.js';
import { engine } from './formula-helpers.js';

// The graph is rebuilt on every run, so unchanged formulas reuse their analysis and
// compiled statements; these checks make sure reuse never changes a result or a message.
describe('reusing analyses and compiled statements', () => {
  it('gives the same analysis for the same cell and source, a new one when either changes', () => {
    const a = analyseFormula(engine, 'x = p * 2\ny = x + q', 'reuse-1');
    expect(analyseFormula(engine, 'x = p * 2\ny = x + q', 'reuse-1')).toBe(a);
    expect(analyseFormula(engine, 'x = p * 3\ny = x + q', 'reuse-1')).not.toBe(a);
    expect(analyseFormula(engine, 'x = p * 2\ny = x + q', 'reuse-2')).not.toBe(a);
    expect(a.reads.sort()).toEqual(['p', 'q']);
  });

  it('evaluates a reused analysis with each run’s own inputs', () => {
    const source = 'x = p * 2\ny = x + q';
    const first = evaluateFormula(engine, analyseFormula(engine, source, 'reuse-3'), { p: 2, q: 1 }, source, 'reuse-3');
    const second = evaluateFormula(engine, analyseFormula(engine, source, 'reuse-3'), { p: 10, q: -1 }, source, 'reuse-3');
    expect(first.values).toMatchObject({ x: 4, y: 5 });
    expect(second.values).toMatchObject({ x: 20, y: 19 });
  });

  it('raises the same syntax error, with its cell and position, every time', () => {
    const messages = [1, 2].map(() => {
      try {
        analyseFormula(engine, 'a = 1\nb = (2 +', 'reuse-4');
      } catch (e) {
        if (!isEngineError(e)) throw e;
        return e.toData();
      }
      throw new Error('expected a syntax error');
    });
    expect(messages[0]!.code).toBe('formula_syntax');
    expect(messages[0]!.where).toMatchObject({ cell: 'reuse-4', line: 2 });
    expect(messages[1]).toEqual(messages[0]);
    // The same text in another cell names that cell.
    expect(() => analyseFormula(engine, 'a = 1\nb = (2 +', 'reuse-5')).toThrow(expect.objectContaining({ where: expect.objectContaining({ cell: 'reuse-5' }) }));
  });

  it('hashes a recording once and tells two recordings of different content apart', () => {
    const time = Float64Array.from({ length: 100 }, (_, i) => i);
    const recording = (offset: number): Recording => ({
      meta: { fileName: 'a.csv', format: 'csv', device: {}, startMs: 0, sampleIntervalS: 1, totalS: 99, pausedS: 0, balanceSide: 'none', dropouts: 0 },
      time,
      columns: { power: Float64Array.from(time, (t) => offset + t) },
      events: [],
      warnings: [],
    });
    const a = recording(200);
    const b = recording(201);
    expect(hashRecording(a)).toBe(hashRecording(a));
    expect(hashRecording(a)).not.toBe(hashRecording(b));
  });
});
