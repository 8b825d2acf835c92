/**
 * An ISO 8601 date-time with the local offset, e.g. 2026-03-14T09:26:53.589+01:00: how audit events
 * record the local clock. Pure: the host passes the clock's reading and its offset east of UTC in
 * minutes (in JavaScript, −new Date().getTimezoneOffset()).
 */
export function localTime(epochMilliseconds: number, offsetMinutes: number): string {
  const shifted = new Date(epochMilliseconds + offsetMinutes * 60_000).toISOString().slice(0, -1);
  const sign = offsetMinutes < 0 ? '-' : '+';
  const hours = String(Math.floor(Math.abs(offsetMinutes) / 60)).padStart(2, '0');
  const minutes = String(Math.abs(offsetMinutes) % 60).padStart(2, '0');
  return `${shifted}${sign}${hours}:${minutes}`;
}
