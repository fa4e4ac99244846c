/** What a block of an invented ride asks the rider to do. */
export type BlockKind = 'warmup' | 'steady' | 'recovery' | 'cadence_sweep' | 'sprint' | 'coast' | 'pause';

/** One block of a synthetic ride's protocol. */
export interface RideBlock {
  kind: BlockKind;
  durationS: number;
  /** Target power, W (start of a ramp when `endPowerW` is set). */
  powerW: number;
  endPowerW?: number;
  cadenceRpm: number;
  endCadenceRpm?: number;
  /** Physical chainring index, 1 = smallest (FIT: 1 is innermost). */
  front: number;
  /** Physical cog index, 1 = largest (innermost). */
  rear: number;
  /**
   * Chainring index the shifting system reports when it differs from where the chain is:
   * a shift signal sent while the chain did not move.
   */
  reportedFront?: number;
  label?: string;
}

/** 50/34 chainrings, smallest first (index 1 = 34 teeth). */
export const DEFAULT_CHAINRINGS: readonly number[] = [34, 50];
/** An 11-30 12-speed cassette, largest cog first (index 1 = 30 teeth). */
export const DEFAULT_COGS: readonly number[] = [30, 27, 24, 21, 19, 17, 16, 15, 14, 13, 12, 11];

/**
 * The default validation protocol (3600 s): warm-up, steady blocks at 150/250/350 W on the large
 * then the small chainring, a cadence sweep, a block where the reported chainring differs from the
 * physical one, three sprints, coasting, a pause and a cool-down.
 * Assumes 2 chainrings and at least 10 cogs.
 */
export function defaultProtocol(): RideBlock[] {
  const blocks: RideBlock[] = [
    { kind: 'warmup', durationS: 600, powerW: 120, endPowerW: 200, cadenceRpm: 85, front: 2, rear: 6, label: 'Warm-up' },
  ];
  for (const [front, rear] of [
    [2, 8],
    [1, 4],
  ] as const) {
    for (const powerW of [150, 250, 350]) {
      blocks.push({ kind: 'steady', durationS: 240, powerW, cadenceRpm: 90, front, rear, label: `${powerW} W, chainring ${front}` });
      blocks.push({ kind: 'recovery', durationS: 60, powerW: 120, cadenceRpm: 85, front, rear, label: 'Recovery' });
    }
  }
  blocks.push({ kind: 'cadence_sweep', durationS: 300, powerW: 220, cadenceRpm: 60, endCadenceRpm: 110, front: 2, rear: 6, label: 'Cadence sweep' });
  blocks.push({ kind: 'steady', durationS: 240, powerW: 250, cadenceRpm: 90, front: 1, rear: 4, reportedFront: 2, label: '250 W, chain on 1, reported 2' });
  for (let k = 1; k <= 3; k++) {
    blocks.push({ kind: 'sprint', durationS: 10, powerW: 800, cadenceRpm: 110, front: 2, rear: 10, label: `Sprint ${k}` });
    blocks.push({ kind: 'recovery', durationS: 50, powerW: 120, cadenceRpm: 85, front: 2, rear: 6, label: 'Recovery' });
  }
  blocks.push({ kind: 'coast', durationS: 60, powerW: 0, cadenceRpm: 0, front: 2, rear: 6, label: 'Coasting' });
  blocks.push({ kind: 'pause', durationS: 120, powerW: 0, cadenceRpm: 0, front: 2, rear: 6, label: 'Pause' });
  blocks.push({ kind: 'steady', durationS: 300, powerW: 150, cadenceRpm: 85, front: 2, rear: 6, label: 'Cool-down' });
  return blocks;
}
