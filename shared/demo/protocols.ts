import { createRandom } from '../synthetic/random.js';
import type { RideBlock } from '../synthetic/protocol.js';

/** Chainring index of the default 34/50 rings (1 = 34 teeth, 2 = 50 teeth). */
const SMALL = 1;
const BIG = 2;
/** Cogs that keep a straight-ish chain line: 16T with the 50, 21T with the 34. */
const COG_FOR = { [SMALL]: 4, [BIG]: 8 } as const;

function steady(powerW: number, front: 1 | 2, durationS = 240): RideBlock {
  const teeth = front === BIG ? 50 : 34;
  return { kind: 'steady', durationS, powerW, cadenceRpm: 90, front, rear: COG_FOR[front], label: `${powerW} W on ${teeth}T` };
}

function recovery(front: 1 | 2): RideBlock {
  return { kind: 'recovery', durationS: 60, powerW: 120, cadenceRpm: 85, front, rear: COG_FOR[front], label: 'Recovery' };
}

function warmUp(): RideBlock {
  return { kind: 'warmup', durationS: 600, powerW: 120, endPowerW: 200, cadenceRpm: 85, front: BIG, rear: 6, label: 'Warm-up' };
}

/**
 * Trainer protocol for a chainring-dependent effect: 150/250/350 W on the 50T, the same on
 * the 34T, then 200 W on each again, so a gear effect is not confused with time or warming.
 */
export function chainringProtocol(): RideBlock[] {
  const blocks: RideBlock[] = [warmUp()];
  const order: [number, 1 | 2][] = [
    [150, BIG], [250, BIG], [350, BIG], [150, SMALL], [250, SMALL], [350, SMALL], [200, BIG], [200, SMALL],
  ];
  for (const [powerW, front] of order) blocks.push(steady(powerW, front), recovery(front));
  blocks.push({ kind: 'steady', durationS: 300, powerW: 140, cadenceRpm: 85, front: SMALL, rear: 3, label: 'Cool-down' });
  return blocks;
}

/** Trainer power ladder: 150 to 350 W in 50 W steps on the 50T, then again on the 34T. */
export function ladderProtocol(): RideBlock[] {
  const blocks: RideBlock[] = [warmUp()];
  for (const front of [BIG, SMALL] as const) {
    for (const powerW of [150, 200, 250, 300, 350]) blocks.push(steady(powerW, front), recovery(front));
  }
  blocks.push({ kind: 'steady', durationS: 240, powerW: 130, cadenceRpm: 85, front: SMALL, rear: 3, label: 'Cool-down' });
  return blocks;
}

/**
 * An outdoor-style loop of about `hours` hours: rolling terrain as blocks of 2-12 minutes
 * between 130 and 300 W, short descents with coasting, the big ring above ~200 W.
 * Deterministic for a given seed.
 */
export function longRideProtocol(seed: number, hours = 3.5): RideBlock[] {
  const rnd = createRandom(seed);
  const blocks: RideBlock[] = [{ ...warmUp(), label: 'Easy start' }];
  let total = 600;
  let n = 0;
  while (total < hours * 3600 - 600) {
    n++;
    if (n % 5 === 0) {
      const durationS = rnd.int(20, 90);
      blocks.push({ kind: 'coast', durationS, powerW: 0, cadenceRpm: 0, front: BIG, rear: 9, label: 'Descent' });
      total += durationS;
      continue;
    }
    const powerW = 130 + 10 * rnd.int(0, 17);
    const durationS = 60 * rnd.int(2, 12);
    const front: 1 | 2 = powerW >= 200 ? BIG : SMALL;
    const cadenceRpm = 78 + rnd.int(0, 16);
    blocks.push({ kind: 'steady', durationS, powerW, cadenceRpm, front, rear: rnd.int(3, 9), label: powerW >= 240 ? 'Climb' : 'Rolling' });
    total += durationS;
  }
  blocks.push({ kind: 'steady', durationS: 600, powerW: 140, cadenceRpm: 85, front: SMALL, rear: 5, label: 'Easy finish' });
  return blocks;
}
