const units: [Intl.RelativeTimeFormatUnit, number][] = [
  ['year', 365 * 24 * 3600],
  ['month', 30 * 24 * 3600],
  ['week', 7 * 24 * 3600],
  ['day', 24 * 3600],
  ['hour', 3600],
  ['minute', 60],
]

/**
 * "5 minutes ago", "yesterday", "just now" for a last-change column; a bad timestamp gives "—"
 * rather than "NaN years ago". `now` is a parameter so tests need no fake clock.
 */
export function formatLastChange(iso: string, now: Date = new Date(), locale = 'en'): string {
  const then = Date.parse(iso)
  if (Number.isNaN(then)) return '—'
  const seconds = (then - now.getTime()) / 1000
  if (Math.abs(seconds) < 45) return 'just now'
  const rtf = new Intl.RelativeTimeFormat(locale, { numeric: 'auto' })
  for (const [unit, size] of units) {
    if (Math.abs(seconds) >= size) return rtf.format(Math.round(seconds / size), unit)
  }
  return rtf.format(Math.round(seconds / 60), 'minute')
}

/** Full local date and time for tooltips beside a relative time. */
export function formatTimestamp(iso: string, locale?: string): string {
  const t = Date.parse(iso)
  return Number.isNaN(t) ? '—' : new Date(t).toLocaleString(locale, { dateStyle: 'medium', timeStyle: 'short' })
}
