import { EngineError } from '../../errors.js';
import { applyGearOverrides } from '../../engine/apply-gear-overrides.js';
import { gearFromEvents } from '../../engine/gear-from-events.js';
import { inferGears } from '../../engine/infer-gears.js';
import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asTable, findColumn, type TransformInput } from './transform-input.js';

type GearsConfig = Extract<TransformConfig, { op: 'gears' }>;

/**
 * Sets the `front_teeth` and `rear_teeth` columns: from the file's shift events (paired
 * tables already carry them), inferred from speed and cadence, or the existing columns
 * with hand-set overrides applied (the chain's physical position).
 */
export function gearsTransform(config: GearsConfig, source: TransformInput): NotebookTable {
  const input = asTable(source, 'gears');
  const { table } = input;
  let front = findColumn(table, ['front_teeth', 'frontGearTeeth']);
  let rear = findColumn(table, ['rear_teeth', 'rearGearTeeth']);
  if (config.method === 'events' && source.value.kind === 'recording') {
    const g = gearFromEvents(source.value.recording);
    front = g.frontTeeth;
    rear = g.rearTeeth;
  } else if (config.method === 'inferred') {
    const speed = findColumn(table, ['speed', 'ref_speed', 'test_speed']);
    const cadence = findColumn(table, ['cadence', 'ref_cadence', 'test_cadence']);
    if (!speed || !cadence) throw new EngineError('no_column', `"${source.name}" needs speed and cadence to infer gears`);
    const g = inferGears(speed, cadence, { chainrings: config.chainrings, cogs: config.cogs, wheel: config.wheel });
    front = g.frontTeeth;
    rear = g.rearTeeth;
  } else if (config.method === 'override') {
    const g = applyGearOverrides(table.timeS, { ...(front ? { frontTeeth: front } : {}), ...(rear ? { rearTeeth: rear } : {}) }, config.overrides);
    front = g.frontTeeth;
    rear = g.rearTeeth;
  }
  if (!front) throw new EngineError('no_gears', `"${source.name}" has no gear data; infer gears or set them by hand`);
  const columns = { ...table.columns, front_teeth: front, ...(rear ? { rear_teeth: rear } : {}) };
  return { ...input, table: { ...table, columns }, facts: { ...input.facts, gearMethod: config.method } };
}
