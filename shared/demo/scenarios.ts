import type { SyntheticDevice } from '../synthetic/device-view.js';
import type { SynthesizeRideOptions } from '../synthetic/synthesize-ride.js';
import { DEMO_DEVICES, DEMO_RIDERS, type DemoDevice, type DemoRider } from './lab.js';
import { chainringProtocol, ladderProtocol, longRideProtocol } from './protocols.js';

/** Key of a demo scenario; also the key of its notebook. */
export type DemoScenarioKey = 'chainring-gain' | 'trainer-ladder' | 'long-ride';

/** One recording of a demo ride: which device, as what file. */
export interface DemoFileSpec {
  /** Slot of the notebook the file is bound to. */
  slot: 'reference' | 'test';
  device: DemoDevice;
  /** The device as it recorded this ride: the lab model plus this ride's known errors. */
  model: SyntheticDevice;
  fileName: string;
  format: 'fit' | 'csv';
}

/** The known errors built into a scenario's device under test: what the analysis should find. */
export interface DemoTruth {
  /** Device clock minus reference clock, s. */
  clockOffsetS: number;
  /** Left and right gain by chainring teeth (1.08 = reads 8% high). */
  legGains?: { left: Record<number, number>; right: Record<number, number> };
  /** Same scale on both legs and rings. */
  gain?: number;
  driftWPerH?: number;
  dropoutsPerHour?: number;
}

/** A demo ride: who rode it, the protocol, the two recordings and the errors to find. */
export interface DemoScenario {
  key: DemoScenarioKey;
  title: string;
  rider: DemoRider;
  /** Where and how it was ridden, in plain words. */
  setting: string;
  ride: SynthesizeRideOptions;
  reference: DemoFileSpec;
  test: DemoFileSpec;
  truth: DemoTruth;
  /** Stated accuracy of the device under test, percent. */
  statedTolerancePct: number;
}

function spec(slot: DemoFileSpec['slot'], device: DemoDevice, fileName: string, extra: Partial<SyntheticDevice> = {}, format: 'fit' | 'csv' = 'fit'): DemoFileSpec {
  return { slot, device, model: { ...device.model, ...extra }, fileName, format };
}

/** Left leg of the crank reads 8% high on the 50T only. */
const CHAINRING_GAINS = { left: { 34: 1, 50: 1.08 }, right: { 34: 1, 50: 1 } };

/**
 * The three demo rides of the lab. Everything is generated from the seeds below, so the
 * files are byte for byte the same on every start.
 */
export const DEMO_SCENARIOS: Readonly<Record<DemoScenarioKey, DemoScenario>> = {
  'chainring-gain': {
    key: 'chainring-gain',
    title: 'Chainring-dependent gain on one leg',
    rider: DEMO_RIDERS.mara,
    setting: 'Trainer, 34/50 chainrings, 11-30 cassette; steady blocks on each chainring with electronic shifting logging the gear.',
    ride: { seed: 20260302, startMs: Date.UTC(2026, 2, 2, 9, 0, 0), blocks: chainringProtocol() },
    reference: spec('reference', DEMO_DEVICES.mossgateReference, 'mara-2026-03-02-mossgate-r1-reference.fit'),
    // Chainring index 1 = 34T, 2 = 50T: the gains arrays are indexed smallest ring first.
    test: spec('test', DEMO_DEVICES.thimbleCrank, 'mara-2026-03-02-thimble-dx-crank.fit', { gains: { left: [1, 1.08], right: [1, 1] }, clockOffsetS: 4 }),
    truth: { clockOffsetS: 4, legGains: CHAINRING_GAINS },
    statedTolerancePct: 2,
  },
  'trainer-ladder': {
    key: 'trainer-ladder',
    title: 'Steady blocks on a trainer at several powers',
    rider: DEMO_RIDERS.tobin,
    setting: 'Trainer, 150 to 350 W in 50 W steps on the 50T, then again on the 34T, 4 minutes each.',
    ride: { seed: 20260309, startMs: Date.UTC(2026, 2, 9, 17, 30, 0), blocks: ladderProtocol() },
    reference: spec('reference', DEMO_DEVICES.alderwickSpider, 'tobin-2026-03-09-alderwick-spider-reference.fit'),
    test: spec('test', DEMO_DEVICES.pellickPedals, 'tobin-2026-03-09-pellick-p2-pedals.csv', { gains: { left: [1.012, 1.012], right: [1.012, 1.012] }, clockOffsetS: -3 }, 'csv'),
    truth: { clockOffsetS: -3, gain: 1.012 },
    statedTolerancePct: 1.5,
  },
  'long-ride': {
    key: 'long-ride',
    title: 'Long ride with drift and a clock offset',
    rider: DEMO_RIDERS.ilse,
    setting: 'Outdoor loop of 3.5 hours on rolling roads, two head units started by hand, no re-zeroing on the way.',
    ride: { seed: 20260315, startMs: Date.UTC(2026, 2, 15, 8, 0, 0), blocks: longRideProtocol(20260315), powerVariation: 0.05 },
    reference: spec('reference', DEMO_DEVICES.alderwickSpider, 'ilse-2026-03-15-alderwick-spider-reference.fit'),
    test: spec('test', DEMO_DEVICES.quillonSpindle, 'ilse-2026-03-15-quillon-s4-spindle.fit', {
      clockOffsetS: 37,
      driftWPerH: 3,
      dropouts: { perHour: 6, meanLengthS: 5, style: 'missing' },
    }),
    truth: { clockOffsetS: 37, gain: 1, driftWPerH: 3, dropoutsPerHour: 6 },
    statedTolerancePct: 2,
  },
};

/** The scenarios in the order the library shows their notebooks. */
export function listDemoScenarios(): DemoScenario[] {
  return [DEMO_SCENARIOS['chainring-gain'], DEMO_SCENARIOS['trainer-ladder'], DEMO_SCENARIOS['long-ride']];
}
