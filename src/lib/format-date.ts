// Intl.DateTimeFormat is costly to build (a locale and time-zone lookup each time) and lists of
// sessions or sweeps format a date per row, so one formatter per time zone is kept.
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string | undefined): Intl.DateTimeFormat {
  const key = timeZone ?? '';
  let formatter = formatters.get(key);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-CA', {
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
      timeZone,
    });
    formatters.set(key, formatter);
  }
  return formatter;
}

/**
 * Dates as people on the bench read them: ISO-like order, 24-hour clock, in the browser's own time
 * zone, e.g. "2026-03-14 09:26". Invalid input is shown as it came rather than as "Invalid Date".
 *
 * @throws RangeError for a time zone Intl does not know
 */
export function formatDateTime(iso: string, timeZone?: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const parts = formatterFor(timeZone).formatToParts(date);
  const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((entry) => entry.type === type)?.value ?? '';
  return `${part('year')}-${part('month')}-${part('day')} ${part('hour')}:${part('minute')}`;
}
