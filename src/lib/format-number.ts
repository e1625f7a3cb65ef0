/**
 * Numbers as the bench reads them: a value, a space, and its unit with an SI prefix chosen so the
 * figure stays between 1 and 1000 ("1.50 kHz", "316 µV", "92.4 dB"). Shown in JetBrains Mono by
 * the caller (`tabular`). Non-finite values print as "—".
 */

const prefixes = [
  { exponent: 9, symbol: 'G' },
  { exponent: 6, symbol: 'M' },
  { exponent: 3, symbol: 'k' },
  { exponent: 0, symbol: '' },
  { exponent: -3, symbol: 'm' },
  { exponent: -6, symbol: 'µ' },
  { exponent: -9, symbol: 'n' },
] as const;

/** Three significant figures, without an exponent. */
function threeFigures(value: number): string {
  const magnitude = Math.abs(value);
  if (magnitude >= 100) return value.toFixed(0);
  if (magnitude >= 10) return value.toFixed(1);
  return value.toFixed(2);
}

/**
 * A value with an SI-prefixed unit and three significant figures.
 * Example: formatWithPrefix(1500, 'Hz') → "1.50 kHz"; formatWithPrefix(0.000316, 'V') → "316 µV".
 */
export function formatWithPrefix(value: number, unit: string): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${unit}`;
  const exponent = Math.floor(Math.log10(Math.abs(value)));
  const prefix = prefixes.find((candidate) => exponent >= candidate.exponent) ?? prefixes[prefixes.length - 1];
  let scaled = value / 10 ** prefix.exponent;
  // Rounding can carry into the next prefix (999.7 → "1000"): step up instead.
  if (Math.abs(Number(threeFigures(scaled))) >= 1000 && prefix.exponent < 9) {
    const next = prefixes[prefixes.indexOf(prefix) - 1];
    scaled = value / 10 ** next.exponent;
    return `${threeFigures(scaled)} ${next.symbol}${unit}`;
  }
  return `${threeFigures(scaled)} ${prefix.symbol}${unit}`;
}

/** A frequency in hertz. Example: formatHz(100000) → "100 kHz". */
export function formatHz(frequencyHz: number): string {
  return formatWithPrefix(frequencyHz, 'Hz');
}

/** A voltage in volts. Example: formatVolts(0.0125) → "12.5 mV". */
export function formatVolts(volts: number): string {
  return formatWithPrefix(volts, 'V');
}

/** A resistance in ohms. Example: formatOhms(4990) → "4.99 kΩ". */
export function formatOhms(ohms: number): string {
  return formatWithPrefix(ohms, 'Ω');
}

/** A level in decibels with one decimal. Example: formatDb(92.44) → "92.4 dB". */
export function formatDb(decibels: number | null | undefined): string {
  if (decibels === null || decibels === undefined || !Number.isFinite(decibels)) return '—';
  return `${decibels.toFixed(1)} dB`;
}

/** A dimensionless ratio, four significant figures. Example: formatRatio(10.00123) → "10.00". */
export function formatRatio(ratio: number): string {
  if (!Number.isFinite(ratio)) return '—';
  return ratio.toPrecision(4);
}

/** A tolerance fraction as a percentage. Example: formatPercent(0.001) → "0.1 %". */
export function formatPercent(fraction: number): string {
  if (!Number.isFinite(fraction)) return '—';
  return `${Number((fraction * 100).toPrecision(6))} %`;
}
