/**
 * Numbers and dates in the user's locale. Control limits and rates are shown to a few significant
 * digits (enough to tell stepped limits apart, not so many that they suggest false precision).
 */
export function formatNumber(value: number | null, locale?: string, significant = 4): string {
  if (value === null) return 'none';
  if (!Number.isFinite(value)) return String(value);
  if (Number.isInteger(value) && Math.abs(value) < 1e9) return numberFormat(locale, 0).format(value);
  return numberFormat(locale, significant).format(value);
}

// Making an Intl.NumberFormat costs far more than using one, and a table formats hundreds of cells.
const formats = new Map<string, Intl.NumberFormat>();

/** A cached formatter: plain (significant 0) or to `significant` significant digits. */
function numberFormat(locale: string | undefined, significant: number): Intl.NumberFormat {
  const key = `${locale ?? ''}|${significant}`;
  let format = formats.get(key);
  if (!format) {
    format = new Intl.NumberFormat(
      locale,
      significant === 0 ? undefined : { maximumSignificantDigits: significant },
    );
    formats.set(key, format);
  }
  return format;
}

export function formatPercent(value: number, locale?: string, significant = 3): string {
  return new Intl.NumberFormat(locale, { style: 'percent', maximumSignificantDigits: significant }).format(
    value,
  );
}

/** An ISO date or date-time in the user's locale; anything else is shown as it was written. */
export function formatDate(iso: string | undefined, locale?: string): string {
  if (!iso) return '';
  const dateOnly = /^\d{4}-\d{2}-\d{2}$/.test(iso);
  const time = Date.parse(dateOnly ? `${iso}T00:00:00Z` : iso);
  if (Number.isNaN(time)) return iso;
  return new Intl.DateTimeFormat(
    locale,
    dateOnly ? { dateStyle: 'medium', timeZone: 'UTC' } : { dateStyle: 'medium', timeStyle: 'short' },
  ).format(time);
}
