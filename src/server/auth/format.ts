const WHEN = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' });

/** "8 December 2026 at 20:41 UTC" — unambiguous across the shop's locales. */
export function formatWhen(d: Date | string): string {
  return `${WHEN.format(typeof d === 'string' ? new Date(d) : d)} UTC`;
}

const SHORT = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZone: 'UTC' });

/** "1 Dec 2026, 21:02 UTC" — for tables. */
export function formatWhenShort(d: Date | string): string {
  return `${SHORT.format(typeof d === 'string' ? new Date(d) : d)} UTC`;
}
