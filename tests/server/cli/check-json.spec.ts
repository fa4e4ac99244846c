import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { checkJson, type JsonSchema } from '../../../server/cli/check-json.js';
import { compareRecordings } from '../../../shared/engine/compare.js';
import { compareReportSchema } from '../../../shared/engine/compare-report.js';
import { importRecording } from '../../../shared/recording/import-recording.js';
import type { Recording } from '../../../shared/recording/recording.js';
import { generateFixtures } from '../../fixtures/generate.js';

/** What the compare command checks its --json document with when bundled: the report schema as JSON Schema. */
const schema = z.toJSONSchema(compareReportSchema) as JsonSchema;

async function recording(bytes: Uint8Array, name: string): Promise<Recording> {
  const result = await importRecording(bytes, name);
  if (!result.ok) throw new Error(result.error.message);
  return result.recording;
}

/** Paths of every value inside a JSON value (objects, arrays and leaves), as key lists. */
function paths(value: unknown, at: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (at.length > 0) out.push(at);
  if (value !== null && typeof value === 'object') for (const [key, v] of Object.entries(value)) paths(v, [...at, Array.isArray(value) ? Number(key) : key], out);
  return out;
}

type Change = { kind: 'set'; value: unknown } | { kind: 'delete' } | { kind: 'extra' };

function changed(report: unknown, path: (string | number)[], change: Change): unknown {
  const copy = structuredClone(report) as Record<string | number, unknown>;
  let parent = copy;
  for (const key of path.slice(0, -1)) parent = parent[key] as Record<string | number, unknown>;
  const last = path[path.length - 1]!;
  if (change.kind === 'set') parent[last] = change.value;
  else if (change.kind === 'delete') delete parent[last];
  else if (parent[last] !== null && typeof parent[last] === 'object') (parent[last] as Record<string, unknown>)['unexpected'] = 1;
  return copy;
}

describe('checkJson against the compare report schema', () => {
  let report: unknown;

  beforeAll(async () => {
    const fixtures = new Map(generateFixtures().map((f) => [f.name, f.bytes]));
    const reference = await recording(fixtures.get('reference.fit')!, 'reference.fit');
    const tests = [await recording(fixtures.get('crank.fit')!, 'crank.fit'), await recording(fixtures.get('pedals.fit')!, 'pedals.fit')];
    report = JSON.parse(JSON.stringify(compareRecordings(reference, tests, { seed: 2 })));
  });

  it('passes a real report through unchanged, as zod does', () => {
    expect(checkJson(schema, report)).toStrictEqual(compareReportSchema.parse(report));
  });

  it('accepts and refuses exactly what zod does, and returns what zod returns, for any one change to a report', () => {
    const all = paths(report);
    expect(all.length).toBeGreaterThan(300);
    const value = fc.constantFrom<unknown>(Number.NaN, Number.POSITIVE_INFINITY, -1.5, 0, null, 'auto', 'steady', 'x', true, [], [1, 2], {}, undefined);
    const change: fc.Arbitrary<Change> = fc.oneof(
      value.map((v) => ({ kind: 'set' as const, value: v })),
      fc.constant({ kind: 'delete' as const }),
      fc.constant({ kind: 'extra' as const }),
    );
    let refused = 0;
    fc.assert(
      fc.property(fc.constantFrom(...all), change, (path, c) => {
        const input = changed(report, path, c);
        const byZod = compareReportSchema.safeParse(input);
        let mine: { ok: true; data: unknown } | { ok: false; message: string };
        try {
          mine = { ok: true, data: checkJson(schema, input) };
        } catch (error) {
          mine = { ok: false, message: (error as Error).message };
        }
        expect(mine.ok, `${path.join('.')} ${JSON.stringify(c)}: zod ${byZod.success ? 'accepts' : 'refuses'}`).toBe(byZod.success);
        if (mine.ok && byZod.success) expect(JSON.stringify(mine.data)).toBe(JSON.stringify(byZod.data));
        if (!mine.ok) refused++;
      }),
      { numRuns: 400, seed: 20261202 },
    );
    expect(refused).toBeGreaterThan(50); // the changes do reach things zod refuses
  });

  it('names the path and what it found', () => {
    const input = changed(report, ['comparisons', 1, 'agreement', 'biasW'], { kind: 'set', value: Number.NaN });
    expect(() => checkJson(schema, input)).toThrow('comparisons.1.agreement.biasW: expected finite number or null, got NaN');
    expect(() => checkJson(schema, changed(report, ['options', 'seed'], { kind: 'delete' }))).toThrow('options.seed: missing');
    expect(() => checkJson(schema, changed(report, ['comparisons', 0, 'gearSource'], { kind: 'set', value: 'pedal' }))).toThrow(
      'comparisons.0.gearSource: expected one of "reference", "test", "inferred", "none", got "pedal"',
    );
  });

  it('refuses a schema keyword it does not check instead of passing everything', () => {
    const withLength = z.toJSONSchema(z.object({ name: z.string().min(1) })) as JsonSchema;
    expect(() => checkJson(withLength, { name: '' })).toThrow(/"minLength".*does not know/);
  });
});
