import { beforeAll, describe, expect, it } from 'vitest';
import { buildDemoNotebook } from '../../../shared/demo/demo-notebooks.js';
import { DEMO_SCENARIOS } from '../../../shared/demo/scenarios.js';
import { createFormulaEngine } from '../../../shared/formula/create-formula-engine.js';
import { runNotebook, type RunNotebookResult } from '../../../shared/notebook/run-notebook.js';
import { blockOfSegment, factOf, listOf, loadDemoInputs, notFresh, segmentsOf, valueOf, type DemoInputs } from './demo-inputs.js';

const engine = createFormulaEngine();
const BOUND = { reference: 'upload-ref', test: 'upload-test' };

/**
 * Left and right power come from the total and a whole-percent balance, so each second
 * of a leg carries up to +/-1% quantisation; over thousands of seconds with the share
 * moving it averages out to a few tenths of a percent. 0.6 points covers that and the
 * devices' noise.
 */
const LEG_PCT_SLACK = 0.6;

function run(key: keyof typeof DEMO_SCENARIOS, demo: DemoInputs): RunNotebookResult {
  return runNotebook(buildDemoNotebook(key, BOUND), demo.inputs, undefined, { engine });
}

describe('demo notebook: chainring-dependent gain on one leg', () => {
  const scenario = DEMO_SCENARIOS['chainring-gain'];
  let demo: DemoInputs;
  let result: RunNotebookResult;
  beforeAll(async () => {
    demo = await loadDemoInputs(scenario);
    result = run('chainring-gain', demo);
  }, 120_000);

  it('runs every cell to a fresh result', () => {
    expect(notFresh(result.outputs)).toEqual([]);
    expect(result.order).toHaveLength(buildDemoNotebook('chainring-gain', BOUND).cells.length);
  });

  it('recovers the clock offset built into the crank file', () => {
    expect(factOf(result.outputs['align'], 'offsetS')).toBe(scenario.truth.clockOffsetS);
  });

  it('finds the left leg about 8% high on the 50T only, the right leg unchanged', () => {
    const legs = result.outputs['per-leg'];
    const { left, right } = scenario.truth.legGains!;
    expect(valueOf(legs, 'left_big')).toBeCloseTo(100 * (left[50]! - 1), 0);
    expect(Math.abs(valueOf(legs, 'left_big') - 100 * (left[50]! - 1))).toBeLessThan(LEG_PCT_SLACK);
    expect(Math.abs(valueOf(legs, 'left_small') - 100 * (left[34]! - 1))).toBeLessThan(LEG_PCT_SLACK);
    expect(Math.abs(valueOf(legs, 'right_big') - 100 * (right[50]! - 1))).toBeLessThan(LEG_PCT_SLACK);
    expect(Math.abs(valueOf(legs, 'right_small') - 100 * (right[34]! - 1))).toBeLessThan(LEG_PCT_SLACK);
    // Ratio of the chainrings' ratios isolates the gear effect (DOMAIN: per gear state).
    expect(Math.abs(valueOf(legs, 'left_gear_effect') - 100 * (left[50]! / left[34]! - 1))).toBeLessThan(LEG_PCT_SLACK);
  });

  it('puts the total error on the 50T at the left share of the true power times the leg error', () => {
    // Expected from the ride truth, not from the notebook: sum(0.08 * left) / sum(total) over the 50T steady blocks.
    const { truth } = demo.rides;
    let extra = 0;
    let total = 0;
    for (const b of truth.blocks.filter((b) => b.kind === 'steady' && b.front === 2)) {
      for (let i = b.startS; i < b.endS; i++) {
        extra += (scenario.truth.legGains!.left[50]! - 1) * truth.leftPower[i]!;
        total += truth.power[i]!;
      }
    }
    expect(Math.abs(valueOf(result.outputs['per-leg'], 'total_big') - (100 * extra) / total)).toBeLessThan(0.4);
  });

  it('finds every steady block of the protocol and gives each an estimate near the truth for its chainring', () => {
    // The reference clock is the ride's clock, so aligned time equals protocol time.
    const protocol = demo.rides.truth.blocks;
    const found = segmentsOf(result.outputs['steady-blocks']).map((s) => blockOfSegment(protocol, s));
    const steady = protocol.flatMap((b, i) => (b.kind === 'steady' ? [i] : []));
    expect(found).toEqual(steady);
    const rings = listOf(result.outputs['per-block'], 'block_ring');
    const left = listOf(result.outputs['per-block'], 'block_left_pct');
    expect(rings).toEqual(steady.map((i) => demo.rides.truth.chainrings[protocol[i]!.front - 1]));
    rings.forEach((teeth, k) => expect(Math.abs(left[k]! - 100 * (scenario.truth.legGains!.left[teeth]! - 1))).toBeLessThan(1));
  });

  it('draws the bars against the stated tolerance and a Bland-Altman plot', () => {
    const bars = result.outputs['leg-bars']?.result;
    expect(bars?.type).toBe('chart');
    expect(bars?.type === 'chart' && (bars.spec as { usermeta?: { tolerancePct?: number } }).usermeta?.tolerancePct).toBe(scenario.statedTolerancePct);
    expect(result.outputs['agreement']?.result?.type).toBe('chart');
  });
});

describe('demo notebook: steady blocks on a trainer at several powers', () => {
  const scenario = DEMO_SCENARIOS['trainer-ladder'];
  let demo: DemoInputs;
  let result: RunNotebookResult;
  beforeAll(async () => {
    demo = await loadDemoInputs(scenario);
    result = run('trainer-ladder', demo);
  }, 120_000);

  it('runs every cell to a fresh result, the CSV file included', () => {
    expect(notFresh(result.outputs)).toEqual([]);
  });

  it('aligns the CSV within a second of its clock offset', () => {
    // The pedals smooth over 2 s and the spider over 1 s: the correlation peak sits half a second late.
    expect(Math.abs(Number(factOf(result.outputs['align'], 'offsetS')) - scenario.truth.clockOffsetS)).toBeLessThanOrEqual(1);
  });

  it('finds the +1.2% scale on every block and both chainrings, inside the stated tolerance', () => {
    const expectedPct = 100 * (scenario.truth.gain! - 1);
    const blocks = listOf(result.outputs['per-block'], 'block_pct');
    // Reference time is protocol time: every section found lies in one steady block, and every steady block is found.
    const protocol = demo.rides.truth.blocks;
    const found = segmentsOf(result.outputs['steady-blocks']).map((s) => blockOfSegment(protocol, s));
    expect(found).toEqual(protocol.flatMap((b, i) => (b.kind === 'steady' ? [i] : [])));
    expect(blocks).toHaveLength(found.length);
    for (const pct of blocks) expect(Math.abs(pct - expectedPct)).toBeLessThan(0.5);
    const overall = result.outputs['overall'];
    expect(Math.abs(valueOf(overall, 'steady_pct') - expectedPct)).toBeLessThan(0.2);
    expect(valueOf(overall, 'fit', 'slope')).toBeCloseTo(scenario.truth.gain!, 2);
    expect(valueOf(overall, 'blocks_within')).toBe(100);
    // Combined tolerance of two independent devices: sqrt(1.5^2 + 1^2).
    expect(valueOf(overall, 'combined_tolerance')).toBeCloseTo(Math.hypot(1.5, 1), 9);
  });
});

describe('demo notebook: long ride with drift and a clock offset', () => {
  const scenario = DEMO_SCENARIOS['long-ride'];
  let demo: DemoInputs;
  let result: RunNotebookResult;
  beforeAll(async () => {
    demo = await loadDemoInputs(scenario);
    result = run('long-ride', demo);
  }, 120_000);

  it('is a ride of more than three hours', () => {
    expect(demo.inputs.reference.meta.totalS).toBeGreaterThan(3 * 3600);
  });

  it('runs every cell to a fresh result', () => {
    expect(notFresh(result.outputs)).toEqual([]);
  });

  it('recovers the 37 s clock offset automatically', () => {
    expect(factOf(result.outputs['align'], 'offsetS')).toBe(scenario.truth.clockOffsetS);
  });

  it('measures the drift near 3 W per hour', () => {
    expect(Math.abs(valueOf(result.outputs['agreement-figures'], 'drift_w_per_h') - scenario.truth.driftWPerH!)).toBeLessThan(0.3);
  });

  it('keeps dropouts missing and shows the first hour inside the tolerance, the last one outside', () => {
    const out = result.outputs['agreement-figures'];
    const missing = valueOf(out, 'missing_s');
    expect(missing).toBeGreaterThan(0);
    expect(missing).toBeLessThanOrEqual(demo.rides.test.dropoutSamples);
    expect(Math.abs(valueOf(out, 'first_hour_pct'))).toBeLessThan(scenario.statedTolerancePct);
    expect(valueOf(out, 'last_hour_pct')).toBeGreaterThan(scenario.statedTolerancePct);
  });
});

describe('demo notebooks: protocol notes', () => {
  for (const key of ['chainring-gain', 'trainer-ladder', 'long-ride'] as const) {
    it(`${key} opens with the protocol and the usual cautions`, () => {
      const first = buildDemoNotebook(key, BOUND).cells[0]!;
      expect(first.kind).toBe('note');
      const text = first.kind === 'note' ? first.config.markdown : '';
      expect(text).toMatch(/secure the bike on the trainer/i);
      expect(text).toMatch(/rider's own responsibility/i);
      expect(text).toMatch(/qualified mechanic/i);
      expect(text).toMatch(/not a certification/i);
    });
  }
});
