import type { CsvField, CsvUnit } from './csv-mapping.js';

/** What a header says about its column: the field, its unit, or why the unit is unclear. */
export interface HeaderGuess {
  field: CsvField | 'time';
  unit?: CsvUnit;
  /** Set when the header names a field but a unit that cannot be used or decided. */
  unitProblem?: string;
}

const UNIT_WORDS: readonly (readonly [RegExp, CsvUnit])[] = [
  [/\bkw\b/, 'kW'],
  [/\b(w|watts?)\b/, 'W'],
  [/\brpm\b/, 'rpm'],
  [/\b(km\/h|kmh|kph|km_h)\b/, 'km/h'],
  [/\bmph\b/, 'mph'],
  [/\b(m\/s|mps|m_s|ms\^-1)\b/, 'm/s'],
  [/\bbpm\b/, 'bpm'],
];

/**
 * Guesses field and unit from a header such as "Power (W)", "speed_kmh", "L/R balance % left".
 * Returns undefined for headers it does not know.
 */
export function guessHeader(header: string): HeaderGuess | undefined {
  const h = header.toLowerCase().replace(/[_\-]+/g, ' ').replace(/\s+/g, ' ').trim();
  if (/^(time|timestamp|secs?|seconds|elapsed|t|date ?time|clock)\b/.test(h)) {
    return { field: 'time' };
  }
  const unitMatch = UNIT_WORDS.find(([re]) => re.test(h))?.[1];
  const bracketed = /[([]\s*([^)\]]+)\s*[)\]]/.exec(h)?.[1];
  const left = /\b(left|l)\b/.test(h);
  const right = /\b(right|r)\b/.test(h);
  if (/balance|l\/r|lr bal/.test(h)) {
    if (/%?\s*(left|l)\s*%?\s*$/.test(h) || /\(% ?left\)|left ?%|% ?left/.test(h)) return { field: 'balance', unit: '% left' };
    if (/%?\s*(right|r)\s*%?\s*$/.test(h) || /\(% ?right\)|right ?%|% ?right/.test(h)) return { field: 'balance', unit: '% right' };
    return { field: 'balance', unit: '% unknown side' };
  }
  if (/torque eff|\bte\b/.test(h) && (left || right)) return { field: left ? 'leftTorqueEffectiveness' : 'rightTorqueEffectiveness', unit: '%' };
  if (/smoothness|\bps\b/.test(h) && (left || right)) return { field: left ? 'leftPedalSmoothness' : 'rightPedalSmoothness', unit: '%' };
  if (/power|watts|\bpwr\b/.test(h)) {
    const field: CsvField = left && !right ? 'leftPower' : right && !left ? 'rightPower' : 'power';
    if (unitMatch === 'W' || unitMatch === 'kW') return { field, unit: unitMatch };
    if (bracketed && !/^(w|kw|watts?)$/.test(bracketed)) return { field, unitProblem: `unit "${bracketed}" is not a power unit (W or kW)` };
    return { field, unit: 'W' };
  }
  if (/cadence|\bcad\b|^rpm$/.test(h)) return { field: 'cadence', unit: 'rpm' };
  if (/speed|velocity/.test(h)) {
    if (unitMatch === 'km/h' || unitMatch === 'mph' || unitMatch === 'm/s') return { field: 'speed', unit: unitMatch };
    return { field: 'speed', unitProblem: bracketed ? `unit "${bracketed}" is not a speed unit (m/s, km/h, mph)` : 'the header names no unit (m/s, km/h or mph)' };
  }
  if (/heart|^hr\b|^bpm$/.test(h)) return { field: 'heartRate', unit: 'bpm' };
  if (/chainring|front gear|front cog/.test(h)) return /teeth|\bt\b/.test(h) || /^chainring$/.test(h) ? { field: 'frontGearTeeth', unit: 'teeth' } : { field: 'frontGear', unit: 'index' };
  if (/\bcog\b|rear gear|sprocket/.test(h)) return /teeth|\bt\b/.test(h) || /^cog$/.test(h) ? { field: 'rearGearTeeth', unit: 'teeth' } : { field: 'rearGear', unit: 'index' };
  return undefined;
}
