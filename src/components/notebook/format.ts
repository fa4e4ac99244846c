/** Numbers as the notebook shows them: 4 significant digits, thin on noise, "–" for missing. */
export function formatNumber(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  if (v === 0) return '0';
  const abs = Math.abs(v);
  if (abs >= 1e6 || abs < 1e-3) return v.toExponential(2);
  if (Number.isInteger(v) && abs < 1e6) return String(v);
  return Number(v.toPrecision(digits)).toString();
}

/** 3725 s -> "1:02:05"; 65 s -> "1:05". */
export function formatClock(seconds: number): string {
  if (!Number.isFinite(seconds)) return '–';
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const rest = String(s % 60).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${rest}` : `${m}:${rest}`;
}

/** Cogbook's names for the cell kinds and transform operations. */
export const KIND_LABELS = { import: 'Recording', transform: 'Transform', formula: 'Formula', chart: 'Chart', note: 'Note' } as const;

export const OP_LABELS = {
  align: 'Line up two recordings',
  resample: 'Put on a regular grid',
  smooth: 'Moving average',
  trim: 'Keep a time range',
  segment: 'Find blocks',
  gears: 'Attach gear state',
  combine: 'Pair several devices',
} as const;
