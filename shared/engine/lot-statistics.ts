// Statistics of a lot of units: how a CMRR figure spreads across boards and how
// capable the process is against a lower limit.
import { mean, min, sampleStandardDeviation } from 'simple-statistics';
import { EngineInputError } from './errors';
import { validateLimitMask, evaluateLimitMask, type LimitMask } from './limit-mask';

/** Summary of one figure (e.g. CMRR at one frequency) across units. */
export interface LotStatistics {
  /** Number of units. */
  count: number;
  meanDb: number;
  /** Sample standard deviation (n − 1 in the denominator), dB; null for one unit. */
  standardDeviationDb: number | null;
  minimumDb: number;
  /** The lower specification limit used, dB (when given). */
  lowerLimitDb?: number;
  /**
   * Cpk against the lower limit alone, (mean − LSL)/(3s) (also written Cpl),
   * NIST/SEMATECH e-Handbook of Statistical Methods §6.1.6 "What is Process
   * Capability?". Null for one unit or when s = 0 (undefined).
   */
  cpk?: number | null;
}

/**
 * Mean, sample standard deviation, minimum and (with a lower limit) Cpk of a
 * figure across units. Cpk = (mean − LSL)/(3s) with s the sample standard
 * deviation, as in the NIST/SEMATECH e-Handbook (§6.1.6); it assumes a roughly
 * normal spread, so treat it as a guide for CMRR in dB. O(n).
 *
 * @param valuesDb one value per unit, dB (finite; lower bounds should be left out or used knowingly)
 * @param lowerLimitDb LSL, dB (optional)
 * @throws EngineInputError for no values, a non-finite value (row = 1-based unit number) or limit
 * @example lotStatistics([14, 14, 16, 18, 18], 8).cpk // → 1.333
 */
export function lotStatistics(valuesDb: readonly number[], lowerLimitDb?: number): LotStatistics {
  if (valuesDb.length === 0) throw new EngineInputError('lotStatistics requires at least one unit', { field: 'valuesDb' });
  valuesDb.forEach((value, index) => {
    if (!Number.isFinite(value)) {
      throw new EngineInputError(`lotStatistics: unit ${index + 1} has no finite value (${value})`, { row: index + 1, field: 'valuesDb' });
    }
  });
  if (lowerLimitDb !== undefined && !Number.isFinite(lowerLimitDb)) {
    throw new EngineInputError(`lotStatistics requires a finite lower limit, got ${lowerLimitDb}`, { field: 'lowerLimitDb' });
  }
  const values = [...valuesDb];
  const meanDb = mean(values);
  const standardDeviationDb = values.length > 1 ? sampleStandardDeviation(values) : null;
  const result: LotStatistics = { count: values.length, meanDb, standardDeviationDb, minimumDb: min(values) };
  if (lowerLimitDb !== undefined) {
    result.lowerLimitDb = lowerLimitDb;
    result.cpk = standardDeviationDb === null || standardDeviationDb === 0 ? null : (meanDb - lowerLimitDb) / (3 * standardDeviationDb);
  }
  return result;
}

/** Lot statistics at one frequency. */
export interface LotStatisticsAtFrequency extends LotStatistics {
  frequencyHz: number;
}

/**
 * Lot statistics frequency by frequency, for units measured at the same
 * frequencies, with the lower limit at each frequency taken from a mask
 * (outside the mask: no Cpk). O(frequencies · (units + mask corners)).
 *
 * @param frequenciesHz the shared frequencies, Hz
 * @param unitsCmrrDb one row per unit, one CMRR per frequency, dB
 * @param mask optional limit mask
 * @throws EngineInputError for rows of the wrong length (row = unit), bad values or a bad mask
 * @example lotStatisticsByFrequency([100], [[80], [82]])[0].meanDb // → 81
 */
export function lotStatisticsByFrequency(
  frequenciesHz: readonly number[],
  unitsCmrrDb: readonly (readonly number[])[],
  mask?: LimitMask,
): LotStatisticsAtFrequency[] {
  if (mask) validateLimitMask(mask, 'lotStatisticsByFrequency');
  if (unitsCmrrDb.length === 0) throw new EngineInputError('lotStatisticsByFrequency requires at least one unit', { field: 'unitsCmrrDb' });
  unitsCmrrDb.forEach((row, index) => {
    if (row.length !== frequenciesHz.length) {
      throw new EngineInputError(
        `lotStatisticsByFrequency: unit ${index + 1} has ${row.length} values for ${frequenciesHz.length} frequencies`,
        { row: index + 1, field: 'unitsCmrrDb' },
      );
    }
  });
  return frequenciesHz.map((frequencyHz, column) => {
    const limitDb = mask ? evaluateLimitMask(mask, frequencyHz) : null;
    const values = unitsCmrrDb.map((row) => row[column]);
    return { frequencyHz, ...lotStatistics(values, limitDb ?? undefined) };
  });
}
