import { CrcCalculator } from '@garmin/fitsdk';
import { describe, expect, it } from 'vitest';
import { fitCrc } from '../../../shared/recording/fit-crc.js';
import { createRandom } from '../../../shared/synthetic/random.js';

describe('fitCrc', () => {
  it('matches the FIT SDK CRC calculator on random bytes', () => {
    const rnd = createRandom(3);
    for (let len = 0; len < 300; len += 7) {
      const bytes = Uint8Array.from({ length: len }, () => rnd.int(0, 255));
      expect(fitCrc(bytes)).toBe(CrcCalculator.calculateCRC(bytes, 0, len));
    }
  });

  it('matches it on every start and end within a buffer', () => {
    const rnd = createRandom(5);
    const bytes = Uint8Array.from({ length: 40 }, () => rnd.int(0, 255));
    for (let start = 0; start < 12; start++) {
      for (let end = start; end <= bytes.length; end++) expect(fitCrc(bytes, start, end)).toBe(CrcCalculator.calculateCRC(bytes, start, end));
    }
  });
});
