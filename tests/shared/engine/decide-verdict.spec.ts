import { describe, expect, it } from 'vitest';
import { decideVerdict } from '../../../shared/engine/decide-verdict.js';

describe('decideVerdict', () => {
  it('judges against the combined band sqrt(device^2 + reference^2)', () => {
    const v = decideVerdict(1000, { what: 'total', seconds: 1000, diffPct: 2.2 }, [], { tolerancePct: 2, referenceTolerancePct: 1 });
    expect(v.combinedTolerancePct).toBeCloseTo(Math.sqrt(5), 12);
    expect(v.pass).toBe(true);
    expect(decideVerdict(1000, { what: 'total', seconds: 1000, diffPct: -2.3 }, []).pass).toBe(false);
  });

  it('fails when a leg or gear state holding at least 10% of the time is outside, even with the total inside', () => {
    const v = decideVerdict(1000, { what: 'total', seconds: 1000, diffPct: 1.2 }, [
      { what: 'left leg on 50T', seconds: 300, diffPct: 8 },
      { what: 'right leg', seconds: 1000, diffPct: 0.1 },
    ]);
    expect(v.pass).toBe(false);
    expect(v.checks.find((c) => c.what === 'left leg on 50T')).toMatchObject({ share: 0.3, within: false, decides: true });
    expect(v.findings.join('\n')).toMatch(/Left leg on 50T reads \+8\.0% over 30% of the paired time/);
    expect(v.findings.at(-1)).toMatch(/^Verdict: FAIL: the total is inside the band/);
  });

  it('reports but does not fail on a part under 10% of the time', () => {
    const v = decideVerdict(1000, { what: 'total', seconds: 1000, diffPct: 0.5 }, [{ what: 'total on 39T', seconds: 99, diffPct: 6 }]);
    expect(v.pass).toBe(true);
    expect(v.findings.join('\n')).toMatch(/holds only 10% .* does not decide|holds only 10%/);
  });
});
