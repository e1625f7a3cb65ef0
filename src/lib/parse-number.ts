const suffixes: Record<string, number> = { p: 1e-12, n: 1e-9, u: 1e-6, µ: 1e-6, m: 1e-3, k: 1e3, K: 1e3, M: 1e6, G: 1e9 };
const pattern = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([pnuµmkKMG]?)$/;

/**
 * Reads a number typed into a form, with an optional SI suffix the way values are written on
 * schematics: "4.99k" → 4990, "1M" → 1e6, "100m" → 0.1, "2.2e3" → 2200. A decimal comma is taken
 * as a point. Returns null for blank or unreadable text so the form can say so.
 */
export function parseEngineeringNumber(text: string): number | null {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return null;
  const match = pattern.exec(trimmed);
  if (!match) return null;
  const value = Number(match[1]) * (match[2] ? suffixes[match[2]] : 1);
  return Number.isFinite(value) ? value : null;
}

/** The shortest way to write a number back into a field (no float noise): 4990 → "4990", 0.1 → "0.1". */
export function numberToField(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  return String(Number(value.toPrecision(12)));
}
