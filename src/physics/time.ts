/**
 * Time at the interfaces (DESIGN §3): ISO 8601 with an explicit offset, or an IANA zone; epoch
 * milliseconds inside. Pure functions (Intl only), no I/O.
 */
import { InputError } from './errors.ts';

const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/** Parses "2026-07-21T14:00:00+02:00" (or Z). An offset is required: a local time without one is ambiguous. */
export function parseIsoTime(text: string, place: string): { timeMs: number; offsetMinutes: number } {
  const m = ISO_RE.exec(text.trim());
  if (!m) {
    throw new InputError({ place, problem: 'not an ISO 8601 time with an offset', value: text, expected: 'e.g. 2026-07-21T14:00:00+02:00 or ...Z' });
  }
  const [, y, mo, d, h, mi, s, frac, off] = m;
  const year = Number(y), month = Number(mo), day = Number(d), hour = Number(h), minute = Number(mi), sec = Number(s ?? 0);
  const offsetMinutes = parseUtcOffsetMinutes(off!, place);
  const localMs = Date.UTC(year, month - 1, day, hour, minute, sec) + (frac ? Math.round(Number(frac) * 1000) : 0);
  const check = new Date(localMs);
  if (month < 1 || month > 12 || check.getUTCDate() !== day || hour > 23 || minute > 59 || sec > 60) {
    throw new InputError({ place, problem: 'not a valid calendar date and time', value: text, expected: 'a real date, hours 00–23, minutes 00–59' });
  }
  return { timeMs: localMs - offsetMinutes * 60000, offsetMinutes };
}

/** "+01:00" / "-0530" / "Z" → minutes east of UTC. */
export function parseUtcOffsetMinutes(text: string, place: string): number {
  if (text === 'Z') return 0;
  const m = /^([+-])(\d{2}):?(\d{2})$/.exec(text);
  if (!m || Number(m[2]) > 14 || Number(m[3]) > 59) {
    throw new InputError({ place, problem: 'not a UTC offset', value: text, expected: 'an offset such as +01:00 or -07:00 (or Z)' });
  }
  const mins = Number(m[2]) * 60 + Number(m[3]);
  return m[1] === '-' ? -mins : mins;
}

/** Offset [minutes east of UTC] of an IANA zone at an instant, e.g. ("Europe/Paris", t) → 120 in summer. */
export function zoneOffsetMinutes(timeZone: string, timeMs: number, place = 'timeZone'): number {
  if (/^(Z|[+-]\d{2}:?\d{2})$/.test(timeZone)) return parseUtcOffsetMinutes(timeZone, place);
  let parts: Intl.DateTimeFormatPart[];
  try {
    parts = new Intl.DateTimeFormat('en-US', {
      timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit',
    }).formatToParts(new Date(timeMs));
  } catch {
    throw new InputError({ place, problem: 'unknown time zone', value: timeZone, expected: 'a UTC offset such as +01:00 or an IANA zone such as Europe/Berlin' });
  }
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asUtc = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second'));
  return Math.round((asUtc - Math.floor(timeMs / 1000) * 1000) / 60000);
}

/** Formats an instant as ISO 8601 local time with the given offset: "2026-07-21T14:00:00+02:00". */
export function formatIsoTime(timeMs: number, offsetMinutes: number): string {
  const local = new Date(timeMs + offsetMinutes * 60000);
  const p2 = (n: number) => String(n).padStart(2, '0');
  const sign = offsetMinutes < 0 ? '-' : '+';
  const a = Math.abs(offsetMinutes);
  return (
    `${local.getUTCFullYear()}-${p2(local.getUTCMonth() + 1)}-${p2(local.getUTCDate())}T` +
    `${p2(local.getUTCHours())}:${p2(local.getUTCMinutes())}:${p2(local.getUTCSeconds())}${sign}${p2(Math.floor(a / 60))}:${p2(a % 60)}`
  );
}
