// `rejectra tolerance --gain G --tolerance FRACTION [--trials N] [--seed S]
// [--distribution uniform|normal] [--limit-db DB] [--target-db DB] [--series E24|E96|E192] [--pairs N] [--json]`:
// the CMRR a four-resistor difference amplifier keeps with resistors within a tolerance (ideal
// op-amp): exact worst case, the (1 + G)/(4ε) approximation and a seeded Monte Carlo; optionally the
// yield against a limit, the tolerance a target needs, and the nearest IEC 60063 resistor pairs.
import { nearestResistorPairs, type ESeriesName } from '../../shared/engine/e-series';
import { EngineInputError } from '../../shared/engine/errors';
import {
  approximateWorstCaseCmrrDb,
  MAXIMUM_MONTE_CARLO_TRIALS,
  monteCarloCmrr,
  toleranceForTargetCmrr,
  worstCaseCmrrDb,
  type ToleranceDistribution,
} from '../../shared/engine/resistor-tolerance';
import { parseCommandArgs } from '../parse-command-args';
import { formatTable } from '../table';

const numbersAfterTheFirstColumn = (column: number) => column > 0;

const usage = `usage: rejectra tolerance --gain G --tolerance FRACTION [--trials N] [--seed S]
         [--distribution uniform|normal] [--limit-db DB] [--target-db DB]
         [--series E24|E96|E192] [--pairs N] [--json]
  G = R2/R1 = R4/R3; FRACTION is every resistor's tolerance (0.001 for 0.1 %), 0 < FRACTION < 0.5.
  Monte Carlo: --trials (default 1000000, at most ${MAXIMUM_MONTE_CARLO_TRIALS}), --seed (default 1), uniform within
  ±tolerance (default) or normal with sigma = tolerance/3. --limit-db adds the yield, --target-db the
  tolerance needed for that CMRR, --series the nearest resistor pairs (--pairs of them, default 5).
`;

const decimalNumber = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const wholeNumber = /^\d+$/;

function parseNumber(option: string, text: string, requirement: string, accept: (value: number) => boolean): number {
  const trimmed = text.trim();
  const value = decimalNumber.test(trimmed) ? Number(trimmed) : Number.NaN;
  if (!Number.isFinite(value) || !accept(value)) {
    throw new EngineInputError(`--${option} must be ${requirement}, got "${text}"`, { field: option });
  }
  return value;
}

function parseWhole(option: string, text: string, requirement: string, accept: (value: number) => boolean): number {
  const trimmed = text.trim();
  const value = wholeNumber.test(trimmed) ? Number(trimmed) : Number.NaN;
  if (!Number.isSafeInteger(value) || !accept(value)) {
    throw new EngineInputError(`--${option} must be ${requirement}, got "${text}"`, { field: option });
  }
  return value;
}

function formatDb(value: number): string {
  return Number.isFinite(value) ? `${value.toFixed(2)} dB` : String(value);
}

function formatPercent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(4))} %`;
}


export async function run(args: string[]): Promise<number> {
  const parsed = parseCommandArgs('tolerance', usage, {
    args,
    allowPositionals: false,
    options: {
      gain: { type: 'string' },
      tolerance: { type: 'string' },
      trials: { type: 'string' },
      seed: { type: 'string' },
      distribution: { type: 'string' },
      'limit-db': { type: 'string' },
      'target-db': { type: 'string' },
      series: { type: 'string' },
      pairs: { type: 'string' },
      json: { type: 'boolean', default: false },
      help: { type: 'boolean', short: 'h' },
    },
  });
  if (typeof parsed === 'number') return parsed;
  const { values } = parsed;
  if (values.gain === undefined) throw new EngineInputError('--gain is required (R2/R1)', { field: 'gain' });
  if (values.tolerance === undefined) throw new EngineInputError('--tolerance is required (a fraction, 0.001 for 0.1 %)', { field: 'tolerance' });
  const gain = parseNumber('gain', values.gain, 'a gain above 0', (value) => value > 0);
  const toleranceFraction = parseNumber(
    'tolerance',
    values.tolerance,
    'a fraction between 0 and 0.5 exclusive (0.001 for 0.1 %)',
    (value) => value > 0 && value < 0.5,
  );
  const trials =
    values.trials === undefined
      ? 1_000_000
      : parseWhole('trials', values.trials, `a whole number of trials from 1 to ${MAXIMUM_MONTE_CARLO_TRIALS}`, (value) => value >= 1 && value <= MAXIMUM_MONTE_CARLO_TRIALS);
  const seed = values.seed === undefined ? 1 : parseWhole('seed', values.seed, 'a non-negative whole number', () => true);
  const distributionText = values.distribution ?? 'uniform';
  if (distributionText !== 'uniform' && distributionText !== 'normal') {
    throw new EngineInputError(`--distribution must be "uniform" or "normal", got "${distributionText}"`, { field: 'distribution' });
  }
  const distribution: ToleranceDistribution = distributionText;
  const limitDb = values['limit-db'] === undefined ? undefined : parseNumber('limit-db', values['limit-db'], 'a level in dB', () => true);
  const targetDb =
    values['target-db'] === undefined ? undefined : parseNumber('target-db', values['target-db'], 'a level above 0 dB', (value) => value > 0);
  let series: ESeriesName | undefined;
  if (values.series !== undefined) {
    const name = values.series.trim().toUpperCase();
    if (name !== 'E24' && name !== 'E96' && name !== 'E192') {
      throw new EngineInputError(`--series must be E24, E96 or E192, got "${values.series}"`, { field: 'series' });
    }
    series = name;
  }
  const pairCount = values.pairs === undefined ? 5 : parseWhole('pairs', values.pairs, 'a whole number from 1 to 100', (value) => value >= 1 && value <= 100);
  if (values.pairs !== undefined && series === undefined) {
    throw new EngineInputError('--pairs needs --series (E24, E96 or E192)', { field: 'pairs' });
  }

  const worstCaseDb = worstCaseCmrrDb(gain, toleranceFraction);
  const approximationDb = approximateWorstCaseCmrrDb(gain, toleranceFraction);
  const monteCarlo = monteCarloCmrr({ gain, toleranceFraction, trials, seed, distribution, limitDb });
  const inverse = targetDb === undefined ? undefined : { targetDb, ...toleranceForTargetCmrr(gain, targetDb) };
  const pairs = series === undefined ? undefined : nearestResistorPairs(gain, series, { count: pairCount, toleranceFraction });

  if (values.json) {
    const document = {
      gain,
      toleranceFraction,
      worstCaseDb,
      approximationDb,
      monteCarlo: {
        trials: monteCarlo.trials,
        seed: monteCarlo.seed,
        distribution: monteCarlo.distribution,
        p05Db: monteCarlo.p05Db,
        p50Db: monteCarlo.p50Db,
        p95Db: monteCarlo.p95Db,
        ...(monteCarlo.yieldFraction === undefined ? {} : { limitDb: monteCarlo.limitDb, yieldFraction: monteCarlo.yieldFraction }),
      },
      ...(inverse ? { inverse } : {}),
      ...(pairs ? { series, pairs } : {}),
    };
    process.stdout.write(`${JSON.stringify(document, null, 2)}\n`);
    return 0;
  }
  const spread = distribution === 'uniform' ? `uniform within ±${formatPercent(toleranceFraction)}` : `normal, σ = ${formatPercent(toleranceFraction / 3)}`;
  const lines = [
    `difference amplifier, gain ${gain}, every resistor ±${formatPercent(toleranceFraction)}, ideal op-amp`,
    '',
    formatTable([
      ['worst case (16 corners)', formatDb(worstCaseDb)],
      ['approximation (1 + G)/(4ε)', formatDb(approximationDb)],
      [`Monte Carlo 5th percentile`, formatDb(monteCarlo.p05Db)],
      [`Monte Carlo median`, formatDb(monteCarlo.p50Db)],
      [`Monte Carlo 95th percentile`, formatDb(monteCarlo.p95Db)],
      ...(monteCarlo.yieldFraction === undefined
        ? []
        : [[`yield at ≥ ${formatDb(limitDb as number)}`, formatPercent(monteCarlo.yieldFraction)]]),
    ], numbersAfterTheFirstColumn),
    `(Monte Carlo: ${trials} trials, seed ${seed}, ${spread})`,
  ];
  if (inverse) {
    lines.push(
      '',
      `for ${formatDb(inverse.targetDb)} at gain ${gain}: tolerance ${formatPercent(inverse.worstCaseToleranceFraction)} (exact worst case), ` +
        `${formatPercent(inverse.approximationToleranceFraction)} (approximation)`,
    );
  }
  if (pairs && series) {
    lines.push(
      '',
      `nearest ${series} pairs (R1 = R3, R2 = R4), CMRR at ±${formatPercent(toleranceFraction)}:`,
      formatTable([
        ['R1 (Ω)', 'R2 (Ω)', 'gain', 'gain error', 'worst case', 'approximation'],
        ...pairs.map((pair) => [
          String(pair.r1Ohms),
          String(pair.r2Ohms),
          Number(pair.gain.toPrecision(6)).toString(),
          formatPercent(pair.gainErrorFraction),
          formatDb(pair.worstCaseCmrrDb as number),
          formatDb(pair.approximationCmrrDb as number),
        ]),
      ], numbersAfterTheFirstColumn),
    );
  }
  process.stdout.write(`${lines.join('\n')}\n`);
  return 0;
}
