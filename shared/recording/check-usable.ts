import { EngineError } from '../errors.js';
import { MIN_SAMPLES, type ImportOptions } from './import-result.js';
import type { Recording } from './recording.js';

/**
 * Refuses a recording that cannot be compared: fewer than `minSamples` samples (`too_short`) or no
 * power at all (`no_power`, unless `allowNoPower`).
 */
export function checkUsable(recording: Recording, options: ImportOptions): void {
  const file = recording.meta.fileName;
  const min = options.minSamples ?? MIN_SAMPLES;
  const n = recording.time.length;
  if (n < min) {
    throw new EngineError(
      'too_short',
      `${file} holds only ${n} sample${n === 1 ? '' : 's'}; at least ${min} are needed to find steady sections and line the recording up with another. Check that this is the whole ride.`,
      { file },
    );
  }
  if (options.allowNoPower) return;
  const power = recording.columns.power;
  let valid = 0;
  if (power) for (let i = 0; i < n; i++) if (!Number.isNaN(power[i]!)) valid++;
  if (valid === 0) {
    const what = recording.meta.format === 'fit' ? 'none of its records has a power field' : 'no column holds power';
    throw new EngineError('no_power', `${file} has no power: ${what}, so it cannot be compared with another device.`, { file, field: 'power' });
  }
}
