// The compare view's address: `?sessions=id1,id2,…&f=1000`, so a comparison can be shared by link.

/** Most sessions drawn together; more becomes unreadable on one chart. */
export const MAX_COMPARED_SESSIONS = 8;
export const DEFAULT_COMPARE_FREQUENCY_HZ = 1000;

/** Session ids from the address: comma-separated, blanks and repeats dropped, at most MAX_COMPARED_SESSIONS, order kept (the first is the reference). */
export function parseSessionIds(text: string): string[] {
  const ids: string[] = [];
  for (const part of text.split(',')) {
    const id = part.trim();
    if (id && !ids.includes(id) && ids.length < MAX_COMPARED_SESSIONS) ids.push(id);
  }
  return ids;
}

export function serialiseSessionIds(ids: readonly string[]): string {
  return ids.join(',');
}

/**
 * A comparison frequency typed by a person, in hertz, with an optional SI prefix: "1000", "1 kHz",
 * "2.5k", "50 Hz", "1e4". Null when it is not a positive finite frequency.
 */
export function parseFrequencyHz(text: string): number | null {
  const match = /^\s*([0-9]*\.?[0-9]+(?:e[+-]?\d+)?)\s*([kKmM]?)\s*(?:hz|Hz|HZ)?\s*$/.exec(text.replace(',', '.'));
  if (!match) return null;
  const scale = { '': 1, k: 1e3, K: 1e3, M: 1e6, m: 1e-3 }[match[2]] ?? 1;
  const value = Number(match[1]) * scale;
  return Number.isFinite(value) && value > 0 ? value : null;
}

/** A frequency as the address holds it: plain hertz, at most 6 significant digits. */
export function serialiseFrequencyHz(frequencyHz: number): string {
  return String(Number(frequencyHz.toPrecision(6)));
}
