import { createRandom } from './random.js';
import { DEFAULT_CHAINRINGS, DEFAULT_COGS, defaultProtocol, type RideBlock } from './protocol.js';

/** Options of {@link synthesizeRide}. Every default gives the same ride for the same seed. */
export interface SynthesizeRideOptions {
  seed: number;
  /** Base sample rate of the truth, Hz (default 1). */
  rateHz?: 1 | 10;
  /** Absolute start, ms since the Unix epoch (default 2026-03-02T09:00:00Z). */
  startMs?: number;
  /** Chainring teeth, smallest first (default 34/50). */
  chainrings?: readonly number[];
  /** Cog teeth, largest first (default 11-30, 12 cogs). */
  cogs?: readonly number[];
  /** ETRTO tyre: width and bead-seat diameter, mm (default 25-622). */
  tyre?: { widthMm: number; bsdMm: number };
  blocks?: readonly RideBlock[];
  /** Mean true left share of power, 0..1 (default 0.52). */
  leftShare?: number;
  /** SD of the rider's own power variation inside a block, as a fraction (default 0.02). */
  powerVariation?: number;
}

/** A block placed on the ride's time axis (seconds from the start). */
export interface PlacedBlock extends RideBlock {
  startS: number;
  endS: number;
}

/** A change of reported gear state, as electronic shifting would log it. */
export interface TruthGearEvent {
  t: number;
  source: 'front_gear_change' | 'rear_gear_change';
  front: { index: number; teeth: number };
  rear: { index: number; teeth: number };
}

/**
 * The exact truth of an invented ride at the base rate: what the rider really produced.
 * Columns are Float64Array of equal length on `time` (s from the start, pauses included).
 * Gear columns hold the reported state; `physicalFront*` where the chain really was.
 */
export interface RideTruth {
  seed: number;
  rateHz: number;
  startMs: number;
  chainrings: readonly number[];
  cogs: readonly number[];
  /** Rolling circumference pi * (BSD + 2 * width), m. */
  circumferenceM: number;
  blocks: PlacedBlock[];
  time: Float64Array;
  power: Float64Array;
  leftPower: Float64Array;
  rightPower: Float64Array;
  cadence: Float64Array;
  speed: Float64Array;
  heartRate: Float64Array;
  leftTorqueEffectiveness: Float64Array;
  rightTorqueEffectiveness: Float64Array;
  leftPedalSmoothness: Float64Array;
  rightPedalSmoothness: Float64Array;
  frontGear: Float64Array;
  frontGearTeeth: Float64Array;
  physicalFrontGear: Float64Array;
  physicalFrontGearTeeth: Float64Array;
  rearGear: Float64Array;
  rearGearTeeth: Float64Array;
  /** 1 while the timer runs, 0 during a pause block. */
  recording: Uint8Array;
  gearEvents: TruthGearEvent[];
}

/**
 * Invents a ride deterministically from a seed: a protocol of blocks (default
 * {@link defaultProtocol}), true left/right power, cadence, speed from gearing and tyre, heart rate,
 * pedal metrics and gear-change events. Device readings come from `deviceView`.
 *
 * @example const ride = synthesizeRide({ seed: 7 }); ride.power.length // 3600
 */
export function synthesizeRide(options: SynthesizeRideOptions): RideTruth {
  const rateHz = options.rateHz ?? 1;
  const chainrings = options.chainrings ?? DEFAULT_CHAINRINGS;
  const cogs = options.cogs ?? DEFAULT_COGS;
  const tyre = options.tyre ?? { widthMm: 25, bsdMm: 622 };
  const circumferenceM = (Math.PI * (tyre.bsdMm + 2 * tyre.widthMm)) / 1000;
  const leftShare = options.leftShare ?? 0.52;
  const variation = options.powerVariation ?? 0.02;
  const rnd = createRandom(options.seed);
  const blocks = placeBlocks(options.blocks ?? defaultProtocol(), rateHz);
  const n = blocks.length > 0 ? Math.round(blocks[blocks.length - 1]!.endS * rateHz) : 0;
  const col = (): Float64Array => new Float64Array(n);
  const truth: RideTruth = {
    seed: options.seed, rateHz, startMs: options.startMs ?? Date.UTC(2026, 2, 2, 9), chainrings, cogs, circumferenceM, blocks,
    time: col(), power: col(), leftPower: col(), rightPower: col(), cadence: col(), speed: col(), heartRate: col(),
    leftTorqueEffectiveness: col(), rightTorqueEffectiveness: col(), leftPedalSmoothness: col(), rightPedalSmoothness: col(),
    frontGear: col(), frontGearTeeth: col(), physicalFrontGear: col(), physicalFrontGearTeeth: col(), rearGear: col(), rearGearTeeth: col(),
    recording: new Uint8Array(n), gearEvents: [],
  };
  const dt = 1 / rateHz;
  // The rider's own fluctuation: an AR(1) process with a ~10 s memory, the same for every device.
  const keep = Math.exp(-dt / 10);
  const kick = Math.sqrt(1 - keep * keep);
  let wobble = 0;
  let hr = 70;
  let speed = 0;
  let reported = { front: -1, rear: -1 };
  let i = 0;
  for (const block of blocks) {
    const count = Math.round((block.endS - block.startS) * rateHz);
    const front = block.reportedFront ?? block.front;
    if (block.kind !== 'pause' && (front !== reported.front || block.rear !== reported.rear)) {
      const state = { front: { index: front, teeth: chainrings[front - 1]! }, rear: { index: block.rear, teeth: cogs[block.rear - 1]! } };
      const source = front !== reported.front ? 'front_gear_change' : 'rear_gear_change';
      truth.gearEvents.push({ t: block.startS, source, ...state });
      reported = { front, rear: block.rear };
    }
    for (let k = 0; k < count; k++, i++) {
      const f = count > 1 ? k / (count - 1) : 0;
      const t = i * dt;
      truth.time[i] = t;
      wobble = keep * wobble + kick * rnd.gaussian();
      const pedalling = block.cadenceRpm > 0 && block.kind !== 'pause';
      const target = block.powerW + ((block.endPowerW ?? block.powerW) - block.powerW) * f;
      const cadence = pedalling ? Math.max(30, block.cadenceRpm + ((block.endCadenceRpm ?? block.cadenceRpm) - block.cadenceRpm) * f + 1.5 * wobble) : 0;
      const power = pedalling ? Math.max(0, target * (1 + variation * wobble)) : 0;
      const share = leftShare + 0.01 * Math.sin((2 * Math.PI * t) / 600);
      truth.recording[i] = block.kind === 'pause' ? 0 : 1;
      truth.power[i] = power;
      truth.leftPower[i] = power * share;
      truth.rightPower[i] = power - power * share;
      truth.cadence[i] = cadence;
      const ratio = chainrings[block.front - 1]! / cogs[block.rear - 1]!;
      // Speed follows the gearing while pedalling; a coasting wheel slows with a 20 s time constant.
      speed = pedalling ? (cadence / 60) * ratio * circumferenceM : block.kind === 'pause' ? 0 : speed * Math.exp(-dt / 20);
      truth.speed[i] = speed;
      hr += (dt / 30) * (65 + 0.32 * power - hr);
      truth.heartRate[i] = hr;
      truth.leftTorqueEffectiveness[i] = pedalling ? 72 + 0.02 * power : NaN;
      truth.rightTorqueEffectiveness[i] = pedalling ? 75 + 0.02 * power : NaN;
      truth.leftPedalSmoothness[i] = pedalling ? 18 + 0.01 * power : NaN;
      truth.rightPedalSmoothness[i] = pedalling ? 20 + 0.01 * power : NaN;
      truth.frontGear[i] = reported.front;
      truth.frontGearTeeth[i] = chainrings[reported.front - 1] ?? NaN;
      truth.physicalFrontGear[i] = block.front;
      truth.physicalFrontGearTeeth[i] = chainrings[block.front - 1]!;
      truth.rearGear[i] = reported.rear;
      truth.rearGearTeeth[i] = cogs[reported.rear - 1] ?? NaN;
    }
  }
  return truth;
}

function placeBlocks(blocks: readonly RideBlock[], rateHz: number): PlacedBlock[] {
  let startS = 0;
  return blocks.map((block) => {
    // Whole base samples per block, so block edges fall on the grid.
    const endS = startS + Math.max(1, Math.round(block.durationS * rateHz)) / rateHz;
    const placed = { ...block, startS, endS };
    startS = endS;
    return placed;
  });
}
