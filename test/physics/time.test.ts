import { describe, it, expect } from 'vitest';
import { parseIsoTime, formatIsoTime, zoneOffsetMinutes } from '../../src/physics/time.ts';
import { InputError } from '../../src/physics/errors.ts';

describe('ISO 8601 times with offsets', () => {
  it('parses the NREL SPA example instant', () => {
    // source: Reda & Andreas 2004, example: 2003-10-17 12:30:30 MST (−7 h) = 19:30:30 UTC
    const { timeMs, offsetMinutes } = parseIsoTime('2003-10-17T12:30:30-07:00', 'time');
    expect(timeMs).toBe(Date.UTC(2003, 9, 17, 19, 30, 30));
    expect(offsetMinutes).toBe(-420);
  });
  it('round-trips through formatIsoTime', () => {
    const t = parseIsoTime('2026-07-21T14:00:00+02:00', 't');
    expect(formatIsoTime(t.timeMs, t.offsetMinutes)).toBe('2026-07-21T14:00:00+02:00');
    expect(formatIsoTime(Date.UTC(2026, 0, 1, 0, 30), -330)).toBe('2025-12-31T19:00:00-05:30');
  });
  it('refuses a time without offset, naming the place', () => {
    expect(() => parseIsoTime('2026-07-21T14:00:00', 'period.start')).toThrow(InputError);
    expect(() => parseIsoTime('2026-07-21T14:00:00', 'period.start')).toThrow(/period\.start/);
    expect(() => parseIsoTime('2026-02-30T14:00:00Z', 'x')).toThrow(/calendar/);
  });
  it('resolves IANA zones with daylight saving', () => {
    expect(zoneOffsetMinutes('Europe/Berlin', Date.UTC(2026, 6, 1))).toBe(120);
    expect(zoneOffsetMinutes('Europe/Berlin', Date.UTC(2026, 0, 1))).toBe(60);
    expect(zoneOffsetMinutes('+05:30', 0)).toBe(330);
    expect(() => zoneOffsetMinutes('Mars/Olympus', 0)).toThrow(/unknown time zone/);
  });
});
