import { describe, expect, it } from 'vitest';
import { formatDateTime } from '../../../src/lib/format-date';

describe('formatDateTime', () => {
  it('writes year-month-day and a 24-hour time in the given zone', () => {
    expect(formatDateTime('2026-03-14T21:26:00.000Z', 'UTC')).toBe('2026-03-14 21:26');
  });

  it('converts to the given time zone', () => {
    // Europe/Oslo is UTC+1 in March before the daylight-saving change (on the last Sunday).
    expect(formatDateTime('2026-03-14T23:30:00.000Z', 'Europe/Oslo')).toBe('2026-03-15 00:30');
  });

  it('shows midnight as 00, not 24', () => {
    expect(formatDateTime('2026-01-02T00:05:00.000Z', 'UTC')).toBe('2026-01-02 00:05');
  });

  it('returns text that is not a date unchanged', () => {
    expect(formatDateTime('not a date', 'UTC')).toBe('not a date');
  });
});

describe('formatDateTime with its kept formatters', () => {
  it('keeps each time zone apart when zones alternate', () => {
    // Same instant, two zones, asked in turn: a formatter kept for one zone must not serve the other.
    const instant = '2026-07-01T12:00:00.000Z';
    expect(formatDateTime(instant, 'UTC')).toBe('2026-07-01 12:00');
    expect(formatDateTime(instant, 'Asia/Tokyo')).toBe('2026-07-01 21:00');
    expect(formatDateTime(instant, 'UTC')).toBe('2026-07-01 12:00');
    expect(formatDateTime(instant, 'America/New_York')).toBe('2026-07-01 08:00');
  });

  it('refuses a time zone Intl does not know, every time it is asked', () => {
    expect(() => formatDateTime('2026-07-01T12:00:00.000Z', 'Mars/Olympus')).toThrow(RangeError);
    expect(() => formatDateTime('2026-07-01T12:00:00.000Z', 'Mars/Olympus')).toThrow(RangeError);
  });
});
