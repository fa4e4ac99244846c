import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { inspectCsv } from '../../../shared/recording/inspect-csv.js';

describe('inspectCsv with power in two units', () => {
  it('still lists the columns for mapping by hand, with no guess and the clash as a warning', () => {
    const text = readFileSync('tests/fixtures/bad/two-power-units.csv', 'utf8');
    const inspection = inspectCsv(text, 'two-power-units.csv');
    expect(inspection.columns.map((c) => c.name)).toEqual(['time (s)', 'power (W)', 'power (kW)', 'cadence (rpm)']);
    expect(inspection.guessedMapping).toBeUndefined();
    expect(inspection.warnings).toEqual([
      expect.objectContaining({ code: 'mixed_units', where: expect.objectContaining({ file: 'two-power-units.csv', row: 1, column: 3, field: 'power (kW)' }) }),
    ]);
    expect(inspection.warnings[0]!.message).toMatch(/"power \(W\)" \(W\) and "power \(kW\)" \(kW, row 1, column 3\)/);
  });
});
