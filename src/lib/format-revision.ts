/**
 * A design revision's label as read in a sentence: "rev C" for a bare label, the label as written
 * when it already says so ("rev D", "Rev 2"). Example: revisionName('B') → "rev B".
 */
export function revisionName(label: string, capital = false): string {
  const trimmed = label.trim();
  if (/^rev(ision)?\b/i.test(trimmed)) return capital ? trimmed[0].toUpperCase() + trimmed.slice(1) : trimmed;
  return `${capital ? 'Rev' : 'rev'} ${trimmed}`;
}
