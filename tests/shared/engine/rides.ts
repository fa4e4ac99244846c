import type { RideBlock } from '../../../shared/synthetic/protocol.js';
import { synthesizeRide, type RideTruth } from '../../../shared/synthetic/synthesize-ride.js';

/**
 * A 41-minute trainer protocol with steady blocks on both chainrings (index 2 = 50T for
 * about 30% of the time, index 1 = 34T for the rest) and no gear-signal tricks, so the
 * reported gear is where the chain is.
 */
export function twoRingBlocks(): RideBlock[] {
  const blocks: RideBlock[] = [{ kind: 'warmup', durationS: 300, powerW: 150, cadenceRpm: 85, front: 1, rear: 5, label: 'Warm-up' }];
  const add = (front: number, rear: number, powers: number[]): void => {
    for (const powerW of powers) {
      blocks.push({ kind: 'steady', durationS: 300, powerW, cadenceRpm: 90, front, rear, label: `${powerW} W ring ${front}` });
      blocks.push({ kind: 'recovery', durationS: 60, powerW: 120, cadenceRpm: 85, front, rear, label: 'Recovery' });
    }
  };
  add(2, 8, [200, 300]);
  add(1, 4, [200, 300, 250, 180]);
  return blocks;
}

/** A seeded ride of {@link twoRingBlocks}. */
export function twoRingRide(seed: number, rateHz: 1 | 10 = 1): RideTruth {
  return synthesizeRide({ seed, rateHz, blocks: twoRingBlocks() });
}
