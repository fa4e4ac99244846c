import { describe, expect, it } from 'vitest';
import { createRandom } from '../../../shared/synthetic/random.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';

describe('createRandom', () => {
  it('repeats for a seed and gives a standard normal', () => {
    const a = createRandom(5);
    const b = createRandom(5);
    expect(Array.from({ length: 5 }, () => a.next())).toEqual(Array.from({ length: 5 }, () => b.next()));
    const rnd = createRandom(9);
    const xs = Array.from({ length: 20000 }, () => rnd.gaussian());
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1));
    // Standard error of the mean of 20000 N(0,1) draws is 0.007; 4 SE bounds.
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(sd - 1)).toBeLessThan(0.02);
  });
});

describe('synthesizeRide', () => {
  const ride = synthesizeRide({ seed: 4 });

  it('is deterministic per seed and runs the default 3600 s protocol', () => {
    expect(Array.from(synthesizeRide({ seed: 4 }).power)).toEqual(Array.from(ride.power));
    expect(Array.from(synthesizeRide({ seed: 5 }).power)).not.toEqual(Array.from(ride.power));
    expect(ride.time.length).toBe(3600);
    expect(synthesizeRide({ seed: 4, rateHz: 10 }).time.length).toBe(36000);
  });

  it('uses the ETRTO 25-622 rolling circumference pi*(622+2*25) mm', () => {
    // Worked example (bikecalcs tyre roll-out calculator, ISO 5775): 25-622 -> 2111.15 mm.
    expect(ride.circumferenceM * 1000).toBeCloseTo(2111.15, 2);
  });

  it('derives speed from cadence, physical gearing and the wheel while pedalling', () => {
    for (let i = 0; i < ride.time.length; i += 97) {
      if (ride.cadence[i] === 0) continue;
      const block = ride.blocks.find((b) => ride.time[i]! >= b.startS && ride.time[i]! < b.endS)!;
      const ratio = ride.chainrings[block.front - 1]! / ride.cogs[block.rear - 1]!;
      // speed = cadence/60 * chainring/cog * circumference (DOMAIN.md, wheel and gear facts)
      expect(ride.speed[i]).toBeCloseTo((ride.cadence[i]! / 60) * ratio * 2.111150263, 6);
    }
  });

  it('splits power exactly into legs, has real zeros when coasting and a reported-only shift', () => {
    for (let i = 0; i < ride.time.length; i++) expect(ride.leftPower[i]! + ride.rightPower[i]!).toBeCloseTo(ride.power[i]!, 9);
    const coast = ride.blocks.find((b) => b.kind === 'coast')!;
    expect(ride.power[coast.startS + 5]).toBe(0);
    const ghost = ride.blocks.find((b) => b.reportedFront !== undefined)!;
    const i = ghost.startS + 10;
    expect([ride.frontGearTeeth[i], ride.physicalFrontGearTeeth[i]]).toEqual([50, 34]);
    const pause = ride.blocks.find((b) => b.kind === 'pause')!;
    expect(ride.recording[pause.startS + 1]).toBe(0);
    expect(ride.gearEvents[0]).toMatchObject({ t: 0, front: { index: 2, teeth: 50 }, rear: { index: 6, teeth: 17 } });
  });
});
