import type { SyntheticDevice } from '../synthetic/device-view.js';

/** An invented rider of the demo lab. */
export interface DemoRider {
  name: string;
  /** What the rider does in the demo rides. */
  role: string;
}

/** An invented power meter of the demo lab: what it is, and how it records in the demo rides. */
export interface DemoDevice {
  /** Label shown in files and charts. */
  label: string;
  /** Where it measures and how many legs. */
  kind: string;
  /** The recording model: gains, noise, clock and link behaviour (see `deviceView`). */
  model: SyntheticDevice;
}

/** The invented people who ride the demo lab's tests. None of them is a real person. */
export const DEMO_RIDERS: Readonly<Record<'mara' | 'tobin' | 'ilse', DemoRider>> = {
  mara: { name: 'Mara Venn', role: 'rides the chainring test on the trainer' },
  tobin: { name: 'Tobin Ashgrove', role: 'rides the power ladder on the trainer' },
  ilse: { name: 'Ilse Corrow', role: 'rides the long outdoor loop' },
};

/**
 * The invented devices of the demo lab. Names, makers and products are made up;
 * manufacturer id 255 is FIT's "development" id, not a brand.
 */
export const DEMO_DEVICES = {
  mossgateReference: {
    label: 'Mossgate R1 reference pedals',
    kind: 'dual-sided pedals, the lab reference for per-leg work (static weight test within 0.5%)',
    model: { label: 'Mossgate R1 reference pedals', serialNumber: 41001, productId: 11, product: 'Mossgate R1', softwareVersion: '3.10', noiseSdW: 3, smoothingS: 1 },
  },
  thimbleCrank: {
    label: 'Thimble DX crank',
    kind: 'dual-sided crank (left and right arm gauges), device under test',
    model: { label: 'Thimble DX crank', serialNumber: 52017, productId: 21, product: 'Thimble DX', softwareVersion: '1.42', noiseSdW: 4, smoothingS: 2 },
  },
  alderwickSpider: {
    label: 'Alderwick spider reference',
    kind: 'spider (total power only), the lab reference for totals',
    model: { label: 'Alderwick spider reference', serialNumber: 30077, productId: 31, product: 'Alderwick SR', softwareVersion: '5.02', noiseSdW: 2.5, smoothingS: 1, balance: 'none' },
  },
  pellickPedals: {
    label: 'Pellick P2 pedals',
    kind: 'dual-sided pedals, device under test (stated accuracy +/-1.5%)',
    model: { label: 'Pellick P2 pedals', serialNumber: 62230, productId: 41, product: 'Pellick P2', softwareVersion: '2.07', noiseSdW: 4, smoothingS: 2 },
  },
  quillonSpindle: {
    label: 'Quillon S4 spindle',
    kind: 'bottom-bracket spindle (total power only), device under test',
    model: { label: 'Quillon S4 spindle', serialNumber: 71105, productId: 51, product: 'Quillon S4', softwareVersion: '0.98', noiseSdW: 4, smoothingS: 1, balance: 'none' },
  },
} as const satisfies Record<string, DemoDevice>;

/** Key of a device in {@link DEMO_DEVICES}. */
export type DemoDeviceKey = keyof typeof DEMO_DEVICES;
