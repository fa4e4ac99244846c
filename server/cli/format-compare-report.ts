import type { CompareReport, FileInfo } from '../../shared/engine/compare-report.js';

/**
 * The comparison report as plain text for a terminal: per device the alignment, a table
 * of means by leg, one line per chainring and per section, agreement, regression,
 * diagnosis and verdict with its findings.
 *
 * @example console.log(formatCompareReport(report))
 */
export function formatCompareReport(report: CompareReport): string {
  const lines: string[] = [];
  lines.push(`Reference  ${describeFile(report.reference)}`);
  for (const c of report.comparisons) {
    lines.push('', `Device under test  ${describeFile(c.test)}`);
    const a = c.alignment;
    lines.push(
      `Alignment  offset ${signed(a.offsetSeconds, 0)} s (${a.method}), correlation ${fixed(a.correlation, 3)}, confidence ${fixed(a.confidence, 2)}; ` +
        `overlap ${duration(c.overlapSeconds)}, paired ${duration(c.pairedSeconds)}`,
    );
    lines.push('', table(['', 'reference W', 'test W', 'diff W', 'diff %'], (['total', 'left', 'right'] as const).map((side) => [
      side,
      fixed(c.overall.reference[side], 1),
      fixed(c.overall.test[side], 1),
      signed(c.overall.diffW[side], 1),
      signed(c.overall.diffPct[side], 2),
    ])));
    if (c.byFrontGear.length > 0) {
      lines.push('', `Per chainring (gears from ${c.gearSource})`);
      lines.push(table(['chainring', 'time', 'share', 'ref W', 'test W', 'total %', 'left %', 'right %'], c.byFrontGear.map((g) => [
        `${g.teeth}T`, duration(g.seconds), `${Math.round(g.share * 100)}%`, fixed(g.reference.total, 1), fixed(g.test.total, 1),
        signed(g.diffPct.total, 2), signed(g.diffPct.left, 2), signed(g.diffPct.right, 2),
      ])));
    }
    const p = c.segmentation.params;
    const how = c.segmentation.source === 'steady' ? `steady blocks: ±${p.tolerancePct}% for ≥ ${p.minDurationS} s, ${p.trimS} s trimmed` : c.segmentation.source;
    lines.push('', `Sections (${how})`);
    lines.push(c.segments.length === 0 ? '  none' : table(['start', 'end', 'kind', 'ref W', 'test W', 'total %', 'left %', 'right %'], c.segments.map((s) => [
      clock(s.startS), clock(s.endS), s.kind, fixed(s.reference.total, 1), fixed(s.test.total, 1),
      signed(s.diffPct.total, 2), signed(s.diffPct.left, 2), signed(s.diffPct.right, 2),
    ])));
    const pooled = c.sectionsPooled;
    if (c.segments.length > 0) {
      lines.push(
        `  all sections (${duration(pooled.seconds)}): total ${signed(pooled.diffPct.total, 2)}%, left ${signed(pooled.diffPct.left, 2)}%, right ${signed(pooled.diffPct.right, 2)}%; ` +
          `mean of section ratios ${signed(pooled.meanOfSectionRatiosPct.total, 2)}%`,
      );
    }
    const g = c.agreement;
    const r = c.regression;
    lines.push(
      '',
      `Agreement  bias ${signed(g.biasW, 1)} W, limits of agreement ${signed(g.loaLowW, 1)} to ${signed(g.loaHighW, 1)} W (n = ${g.n})`,
      `Regression test = ${fixed(r.slope, 4)} × reference ${signed(r.intercept, 1)} W, r = ${fixed(r.r, 4)}, RMSE ${fixed(r.rmseW, 1)} W; drift ${signed(c.drift.wPerHour, 2)} W/h`,
    );
    const ci = c.overall.ratioCi.total;
    if (ci !== null) lines.push(`Ratio      ${fixed(ci.estimate, 4)} (95% CI ${fixed(ci.low, 4)} to ${fixed(ci.high, 4)}, block bootstrap)`);
    lines.push('', 'Diagnosis', ...c.diagnosis.findings.map((f) => `  - ${f}`));
    const v = c.verdict;
    lines.push('', `Verdict    ${v.pass ? 'PASS' : 'FAIL'} (device ±${v.tolerancePct}%, reference ±${v.referenceTolerancePct}%, combined ±${v.combinedTolerancePct.toFixed(2)}%)`);
    lines.push(...v.findings.map((f) => `  - ${f}`));
    if (c.warnings.length > 0) lines.push('', 'Warnings', ...c.warnings.map((w) => `  - ${w.message}`));
  }
  return lines.join('\n');
}

function describeFile(f: FileInfo): string {
  const device = [f.label, f.manufacturer, f.product].filter((x) => x !== null && x !== '').join(', ');
  return `${f.fileName}${device ? ` (${device})` : ''}, ${f.startIso ?? 'no absolute time'}, ${duration(f.durationS)}, every ${f.sampleIntervalS} s, ${f.dropouts} dropouts`;
}

function table(header: string[], rows: string[][]): string {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const line = (cells: string[]): string => '  ' + cells.map((cell, i) => (i === 0 ? cell.padEnd(widths[i]!) : cell.padStart(widths[i]!))).join('  ');
  return [line(header), ...rows.map(line)].join('\n');
}

function fixed(x: number | null, digits: number): string {
  return x === null ? '-' : x.toFixed(digits);
}

function signed(x: number | null, digits: number): string {
  if (x === null) return '-';
  const text = x.toFixed(digits);
  return x >= 0 ? `+${text}` : text;
}

function duration(seconds: number): string {
  const s = Math.round(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  return h > 0 ? `${h} h ${String(m).padStart(2, '0')} min` : `${m} min ${String(s % 60).padStart(2, '0')} s`;
}

function clock(seconds: number): string {
  const s = Math.round(seconds);
  return `${Math.floor(s / 3600)}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}:${String(s % 60).padStart(2, '0')}`;
}
