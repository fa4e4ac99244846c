import { describe, expect, it } from 'vitest';
import { applyGearOverrides } from '../../../shared/engine/apply-gear-overrides.js';
import { gearFromEvents } from '../../../shared/engine/gear-from-events.js';
import { inferGears } from '../../../shared/engine/infer-gears.js';
import { parseEtrto } from '../../../shared/engine/parse-etrto.js';
import facts from '../../fixtures/reference/cycling_and_fit_facts.json' with { type: 'json' };
import { recordingOf } from './builders.js';

describe('parseEtrto', () => {
  // Worked examples: cycling_and_fit_facts.json, tyre_size.worked_examples
  // (ETRTO / ISO 5775 designation; circumference pi * (BSD + 2 * width)).
  it.each(facts.tyre_size.worked_examples)('reads $etrto as $expected_geometric_circumference_mm mm', (example) => {
    const size = parseEtrto(example.etrto);
    expect(size.widthMm).toBe(example.width_mm);
    expect(size.bsdMm).toBe(example.bsd_mm);
    expect(size.circumferenceMm).toBeCloseTo(example.expected_geometric_circumference_mm, 2);
  });

  it('refuses text that is not an ETRTO size', () => {
    expect(() => parseEtrto('700x25c')).toThrow(expect.objectContaining({ code: 'bad_etrto' }));
  });
});

describe('inferGears', () => {
  const chainrings = [53, 39];
  const cogs = [11, 12, 13, 14, 15, 17, 19, 21, 23, 25, 28];
  const circumferenceM = (Math.PI * (622 + 2 * 25)) / 1000;
  // speed = cadence / 60 * (ring / cog) * circumference (DOMAIN: wheel and gear facts).
  const speedOf = (rpm: number, ring: number, cog: number): number => (rpm / 60) * (ring / cog) * circumferenceM;

  it('picks the ring and cog whose ratio gives the measured speed at that cadence', () => {
    // Combinations whose ratio no other combination comes within 3% of (53x15 and 39x11
    // differ by 0.3%: no speed sensor can tell those apart).
    const cases = [
      [90, 53, 17],
      [85, 39, 23],
      [100, 53, 11],
      [60, 39, 28],
    ] as const;
    const speed = Float64Array.from(cases, ([rpm, ring, cog]) => speedOf(rpm, ring, cog) * 1.005); // 0.5% tyre/reading error
    const cadence = Float64Array.from(cases, ([rpm]) => rpm);
    const out = inferGears(speed, cadence, { chainrings, cogs, wheel: '25-622' });
    expect(Array.from(out.frontTeeth)).toEqual(cases.map((c) => c[1]));
    expect(Array.from(out.rearTeeth)).toEqual(cases.map((c) => c[2]));
    // 53x15 at 90 rpm on 25-622 = 90/60 * 53/15 * 2.11115 m = 11.19 m/s (40.3 km/h)
    expect(speedOf(90, 53, 15)).toBeCloseTo(11.189, 3);
  });

  it('leaves the gear unknown while coasting or when no ratio is close', () => {
    const out = inferGears(Float64Array.of(8, 8, 0, 30), Float64Array.of(0, 10, 90, 90), { chainrings, cogs, wheel: 2111 });
    expect(Array.from(out.frontTeeth).every(Number.isNaN)).toBe(true);
  });
});

describe('gearFromEvents', () => {
  it('replays front and rear changes; unknown before the first event', () => {
    const rec = recordingOf({
      power: [1, 1, 1, 1, 1, 1],
      events: [
        { kind: 'gear', t: 1, front: { index: 2, teeth: 50 }, rear: { index: 6, teeth: 17 } },
        { kind: 'gear', t: 3, rear: { index: 7, teeth: 16 } },
        { kind: 'gear', t: 4.5, front: { index: 1, teeth: 34 } },
      ],
    });
    const g = gearFromEvents(rec);
    expect(Array.from(g.frontTeeth, (v) => (Number.isNaN(v) ? null : v))).toEqual([null, 50, 50, 50, 50, 34]);
    expect(Array.from(g.rearTeeth, (v) => (Number.isNaN(v) ? null : v))).toEqual([null, 17, 17, 16, 16, 16]);
  });

  it('prefers gear columns the parser already filled', () => {
    const rec = recordingOf({ power: [1, 1], columns: { frontGearTeeth: Float64Array.of(39, 53) } });
    expect(Array.from(gearFromEvents(rec).frontTeeth)).toEqual([39, 53]);
  });
});

describe('applyGearOverrides', () => {
  it('replaces the gear over [startS, endS) and leaves the input untouched', () => {
    const timeS = Float64Array.of(0, 1, 2, 3, 4);
    const front = Float64Array.of(50, 50, 50, 50, 50);
    const out = applyGearOverrides(timeS, { frontTeeth: front }, [{ startS: 1, endS: 3, frontTeeth: 34 }]);
    expect(Array.from(out.frontTeeth)).toEqual([50, 34, 34, 50, 50]);
    expect(Array.from(front)).toEqual([50, 50, 50, 50, 50]);
    expect(Array.from(out.rearTeeth).every(Number.isNaN)).toBe(true);
  });
});
