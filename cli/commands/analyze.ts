// `rejectra analyze --differential FILE --common-mode FILE [--average-repeats] [--json]`: CMRR per
// frequency from a differential and a common-mode sweep, and its regression against frequency
// (first-order model of DOMAIN.md, or a smooth curve when that model does not fit).
import { readFileSync } from 'node:fs';
import { analyzeSweeps, type FrequencyFit, type SweepAnalysis } from '../../shared/engine/frequency-fit';
import { parseCommandArgs } from '../parse-command-args';
import { formatTable } from '../table';

const usage = 'usage: rejectra analyze --differential FILE --common-mode FILE [--average-repeats] [--json]\n';

/** JSON has no NaN or Infinity: they become null. */
function finiteOrNull(value: number | null | undefined): number | null {
  return value !== null && value !== undefined && Number.isFinite(value) ? value : null;
}

function formatNumber(value: number | null, significant = 6): string {
  if (value === null || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  return magnitude >= 1e-3 && magnitude < 1e7 ? Number(value.toPrecision(significant)).toString() : value.toExponential(significant - 1);
}

function formatInterval(interval: [number, number] | null, significant = 4): string {
  return interval ? `[${formatNumber(interval[0], significant)}, ${formatNumber(interval[1], significant)}]` : '';
}


function fitJson(fit: FrequencyFit) {
  return {
    model: fit.model,
    modelReason: fit.modelReason,
    cmrrDcDb: finiteOrNull(fit.cmrrDcDb),
    cmrrDcDbInterval95: fit.cmrrDcDbInterval95,
    cmrrCornerHz: finiteOrNull(fit.cmrrCornerHz),
    cmrrCornerHzInterval95: fit.cmrrCornerHzInterval95,
    bandwidthHz: finiteOrNull(fit.bandwidthHz),
    bandwidthHzInterval95: fit.bandwidthHzInterval95,
    ...(fit.bandwidthNote ? { bandwidthNote: fit.bandwidthNote } : {}),
    differentialGainDc: finiteOrNull(fit.differentialGainDc),
    commonModeGainModel: fit.commonModeGainModel,
    highFrequencySlope: fit.highFrequencySlope,
    residualRmsDb: finiteOrNull(fit.residualRmsDb),
    residualsDb: fit.residualsDb.map(finiteOrNull),
    fittedCmrrDb: fit.fittedCmrrDb.map(finiteOrNull),
    activePointCount: fit.activePointCount,
    activeBoundCount: fit.activeBoundCount,
    degreesOfFreedom: fit.degreesOfFreedom,
    ...(fit.smoothDegree !== undefined ? { smoothDegree: fit.smoothDegree } : {}),
    regimes: fit.regimes,
    regimeSentence: fit.regimeSentence,
  };
}

function document(analysis: SweepAnalysis, differentialFile: string, commonModeFile: string) {
  return {
    differentialFile,
    commonModeFile,
    points: analysis.points.map((point) => ({
      frequencyHz: point.frequencyHz,
      ad: point.ad,
      acm: point.acm,
      cmrrDb: point.cmrrDb,
      lowerBound: point.lowerBound,
      interpolated: point.interpolated,
      ...(point.adPhaseDeg !== undefined ? { adPhaseDeg: point.adPhaseDeg } : {}),
      ...(point.acmPhaseDeg !== undefined ? { acmPhaseDeg: point.acmPhaseDeg } : {}),
    })),
    fit: fitJson(analysis.fit),
    warnings: analysis.warnings,
  };
}

function readable(analysis: SweepAnalysis, differentialFile: string, commonModeFile: string): string {
  const { fit, points } = analysis;
  const pointRows = [
    ['frequency (Hz)', 'Ad', 'Acm', 'CMRR (dB)', 'fit (dB)', 'residual (dB)'],
    ...points.map((point, index) => [
      formatNumber(point.frequencyHz),
      formatNumber(point.ad, 5) + (point.interpolated ? '*' : ''),
      (point.lowerBound ? '≤ ' : '') + formatNumber(point.acm, 4),
      (point.lowerBound ? '≥ ' : '') + point.cmrrDb.toFixed(2),
      Number.isFinite(fit.fittedCmrrDb[index]) ? fit.fittedCmrrDb[index].toFixed(2) : '—',
      Number.isFinite(fit.residualsDb[index]) ? fit.residualsDb[index].toFixed(2) : '—',
    ]),
  ];
  const slope = fit.highFrequencySlope;
  const summaryRows = [
    ['files', `${differentialFile} (differential), ${commonModeFile} (common mode)`],
    ['model', fit.model === 'none' ? `no fit: ${fit.modelReason}` : fit.modelReason],
    ['dc CMRR', fit.cmrrDcDb === null ? '—' : `${fit.cmrrDcDb.toFixed(2)} dB  95 % ${formatInterval(fit.cmrrDcDbInterval95)}`.trimEnd()],
    ['CMRR corner', fit.cmrrCornerHz === null ? '—' : `${formatNumber(fit.cmrrCornerHz, 4)} Hz  95 % ${formatInterval(fit.cmrrCornerHzInterval95)}`.trimEnd()],
    ['bandwidth', fit.bandwidthHz === null ? `— (${fit.bandwidthNote ?? 'not fitted'})` : `${formatNumber(fit.bandwidthHz, 4)} Hz  95 % ${formatInterval(fit.bandwidthHzInterval95)}`],
    [
      'HF slope',
      slope
        ? `${slope.dbPerDecade.toFixed(1)} dB/decade  95 % ${formatInterval(slope.interval95, 3)} (${slope.method}, ${formatNumber(slope.fromHz, 4)}–${formatNumber(slope.toHz, 4)} Hz)`
        : '—',
    ],
    ['residual RMS', Number.isFinite(fit.residualRmsDb) ? `${fit.residualRmsDb.toFixed(2)} dB` : '—'],
    ['regimes', fit.regimeSentence],
  ];
  const notes = [
    points.some((point) => point.lowerBound) ? '≥ lower bound: common-mode output within 6 dB of its floor (2·floor used)' : '',
    points.some((point) => point.interpolated) ? '* differential gain interpolated on log-frequency' : '',
  ].filter(Boolean);
  return `${formatTable(pointRows, () => true)}\n${notes.length ? `${notes.join('\n')}\n` : ''}\n${formatTable(summaryRows)}\n`;
}

export async function run(args: string[]): Promise<number> {
  const parsed = parseCommandArgs('analyze', usage, {
    args,
    options: {
      differential: { type: 'string' },
      'common-mode': { type: 'string' },
      'average-repeats': { type: 'boolean', default: false },
      json: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h' },
    },
  });
  if (typeof parsed === 'number') return parsed;
  const { values } = parsed;
  const differentialFile = values.differential;
  const commonModeFile = values['common-mode'];
  if (!differentialFile || !commonModeFile) {
    const missing = [!differentialFile && '--differential FILE', !commonModeFile && '--common-mode FILE'].filter(Boolean);
    process.stderr.write(`rejectra analyze: missing ${missing.join(' and ')}\n${usage}`);
    return 2;
  }

  const texts: Uint8Array[] = [];
  for (const file of [differentialFile, commonModeFile]) {
    try {
      texts.push(readFileSync(file));
    } catch (error) {
      process.stderr.write(`rejectra analyze: cannot read ${file}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}\n`);
      return 1;
    }
  }
  const analysis = analyzeSweeps(texts[0], texts[1], {
    differentialFile,
    commonModeFile,
    averageRepeats: values['average-repeats'],
  });

  for (const warning of analysis.warnings) process.stderr.write(`rejectra analyze: warning: ${warning}\n`);
  if (values.json) {
    process.stdout.write(`${JSON.stringify(document(analysis, differentialFile, commonModeFile), null, 2)}\n`);
  } else {
    process.stdout.write(readable(analysis, differentialFile, commonModeFile));
  }
  return 0;
}
