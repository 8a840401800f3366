const WHEN = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' });

/** "8 December 2026 at 20:41 UTC" — unambiguous across the shop's locales. */
export function formatWhen(d: Date | string): string {
  return `${WHEN.format(typeof d === 'string' ? new Date(d) : d)} UTC`;
}
