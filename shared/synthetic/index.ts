export { createRandom } from './random.js';
export type { Random } from './random.js';
export { DEFAULT_CHAINRINGS, DEFAULT_COGS, defaultProtocol } from './protocol.js';
export type { BlockKind, RideBlock } from './protocol.js';
export { synthesizeRide } from './synthesize-ride.js';
export type { PlacedBlock, RideTruth, SynthesizeRideOptions, TruthGearEvent } from './synthesize-ride.js';
export { deviceView } from './device-view.js';
export type { DeviceView, SyntheticDevice } from './device-view.js';
