import { describe, expect, it } from 'vitest';
import { deviceDisplayName } from '../../../shared/api/uploads.js';

describe('deviceDisplayName', () => {
  it('joins maker, product and serial as far as the file states them', () => {
    expect(deviceDisplayName({ manufacturer: 'ridgewright', product: 'Spider PM', serialNumber: 4021 })).toBe('ridgewright Spider PM · serial 4021');
    expect(deviceDisplayName({ product: 'Spider PM' })).toBe('Spider PM');
    expect(deviceDisplayName({ serialNumber: 7 })).toBe('serial 7');
  });

  it('falls back to numeric ids and leaves out the FIT placeholder maker (development, id 255)', () => {
    expect(deviceDisplayName({ manufacturerId: 263, productId: 12 })).toBe('maker #263 product #12');
    expect(deviceDisplayName({ manufacturer: 'development', manufacturerId: 255, product: 'Thimble DX', serialNumber: 52017 })).toBe('Thimble DX · serial 52017');
  });

  it('is null when the file names nothing', () => {
    expect(deviceDisplayName({})).toBeNull();
    expect(deviceDisplayName({ manufacturer: 'development' })).toBeNull();
  });
});
