import type { TransformConfig } from '../cell-config.js';
import type { CellValue, NotebookTable } from '../cell-value.js';
import { alignTransform } from './align.js';
import { combineTransform } from './combine.js';
import { gearsTransform } from './gears.js';
import { resampleTransform } from './resample.js';
import { segmentTransform } from './segment.js';
import { smoothTransform } from './smooth.js';
import type { TransformInput } from './transform-input.js';
import { trimTransform } from './trim.js';

/**
 * Runs one transform cell. `read(name)` gives the value of the cell with that name (the
 * runner only calls this after those cells ran).
 */
export function runTransform(config: TransformConfig, read: (name: string) => CellValue): NotebookTable {
  const input = (name: string): TransformInput => ({ name, value: read(name) });
  switch (config.op) {
    case 'align':
      return alignTransform(config, input(config.reference), input(config.test));
    case 'resample':
      return resampleTransform(config, input(config.source));
    case 'smooth':
      return smoothTransform(config, input(config.source));
    case 'trim':
      return trimTransform(config, input(config.source));
    case 'segment':
      return segmentTransform(config, input(config.source));
    case 'gears':
      return gearsTransform(config, input(config.source));
    case 'combine':
      return combineTransform(config, config.sources.map(input));
  }
}
