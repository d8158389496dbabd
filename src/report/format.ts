/**
 * Text helpers of the review report: HTML escaping, fixed-decimal numbers, and reading local clock
 * time out of the ISO 8601 labels of `Results.times` (the labels carry the site's offset, so the
 * report shows them as written rather than through the machine's own time zone).
 */

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escapes text for HTML element content and attribute values. */
export function esc(text: unknown): string {
  return String(text).replace(/[&<>"']/g, (c) => ESCAPES[c]!);
}

/** A number with `decimals` places, or an em dash for null / non-finite. −0 prints as 0. */
export function fixed(value: number | null | undefined, decimals = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const s = value.toFixed(decimals);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'] as const;

/** Month name (three letters) of month number 1–12. */
export function monthName(month: number): string {
  return MONTHS[month - 1] ?? String(month);
}

export interface LocalTime {
  year: number;
  /** 1–12 */
  month: number;
  day: number;
  /** Clock hour 0–23 and minutes, as written in the label. */
  hour: number;
  minute: number;
  /** The offset as written ("+02:00", "Z"), or "" when absent. */
  offset: string;
}

/** Splits an ISO 8601 label "2026-07-15T15:00:00+02:00" into its local clock fields. */
export function parseLocal(label: string): LocalTime {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::\d{2}(?:\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?$/.exec(label);
  if (!m) return { year: NaN, month: NaN, day: NaN, hour: NaN, minute: NaN, offset: '' };
  return { year: +m[1]!, month: +m[2]!, day: +m[3]!, hour: +m[4]!, minute: +m[5]!, offset: m[6] ?? '' };
}

/** "15 Jul 15:00" from an ISO label (local clock time of the label). */
export function shortTime(label: string | null | undefined): string {
  if (!label) return '—';
  const t = parseLocal(label);
  if (!Number.isFinite(t.month)) return label;
  return `${t.day} ${monthName(t.month)} ${String(t.hour).padStart(2, '0')}:${String(t.minute).padStart(2, '0')}`;
}

/** "15 Jul 2026" from an ISO label. */
export function shortDate(label: string | null | undefined): string {
  if (!label) return '—';
  const t = parseLocal(label);
  if (!Number.isFinite(t.month)) return label;
  return `${t.day} ${monthName(t.month)} ${t.year}`;
}
