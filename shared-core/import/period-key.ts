/**
 * The period an event belongs to when events are grouped by day, ISO week or shift.
 *
 * ISO 8601 weeks start on Monday; week 1 of a year is the week that holds its first Thursday (the
 * week of January 4), so the last days of December can fall in week 1 of the next year and the
 * first days of January in week 52 or 53 of the year before.
 */
export interface PeriodKey {
  /** The period's label: `2026-03-02`, `2026-W10`, `2026-03-02 S2`. */
  label: string;
  /** Where the period starts, for ordering: an ISO date or date-time. */
  start: string;
}

const dayMs = 86_400_000;
const pad = (value: number) => String(value).padStart(2, '0');
const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);
const dayStart = (date: string) => Date.parse(`${date.slice(0, 10)}T00:00:00Z`);

export function dayKey(date: string): PeriodKey {
  const day = date.slice(0, 10);
  return { label: day, start: day };
}

/** The ISO year and week of a date, and the Monday that starts the week. */
export function isoWeek(date: string): { year: number; week: number; monday: string } {
  const ms = dayStart(date);
  const weekday = (new Date(ms).getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
  const monday = ms - weekday * dayMs;
  const thursday = monday + 3 * dayMs;
  const year = new Date(thursday).getUTCFullYear();
  const january4 = Date.UTC(year, 0, 4);
  const firstMonday = january4 - ((new Date(january4).getUTCDay() + 6) % 7) * dayMs;
  return { year, week: 1 + Math.round((monday - firstMonday) / (7 * dayMs)), monday: isoDay(monday) };
}

export function weekKey(date: string): PeriodKey {
  const { year, week, monday } = isoWeek(date);
  return { label: `${year}-W${pad(week)}`, start: monday };
}

/** Shift start times as minutes after midnight, checked and sorted; null when one is not HH:MM. */
export function shiftStartMinutes(starts: string[]): number[] | null {
  const minutes: number[] = [];
  for (const start of starts) {
    const match = /^(\d{1,2}):(\d{2})$/.exec(start.trim());
    if (!match || Number(match[1]) > 23 || Number(match[2]) > 59) return null;
    minutes.push(Number(match[1]) * 60 + Number(match[2]));
  }
  if (minutes.length === 0 || new Set(minutes).size !== minutes.length) return null;
  return minutes.sort((a, b) => a - b);
}

/** Three eight-hour shifts from 06:00, a common practice in plants running around the clock. */
export const defaultShiftStarts = ['06:00', '14:00', '22:00'];

/**
 * The shift of a date-time: the last shift start at or before it; a time before the first start
 * belongs to the last shift of the day before (a night shift runs past midnight). Shifts are
 * numbered S1, S2, … in order of their start times.
 */
export function shiftKey(dateTime: string, startMinutes: number[]): PeriodKey | null {
  if (dateTime.length < 16) return null;
  const minutes = Number(dateTime.slice(11, 13)) * 60 + Number(dateTime.slice(14, 16));
  let day = dayStart(dateTime);
  let index = startMinutes.findLastIndex((start) => start <= minutes);
  if (index < 0) {
    index = startMinutes.length - 1;
    day -= dayMs;
  }
  const start = startMinutes[index];
  const date = isoDay(day);
  return {
    label: `${date} S${index + 1}`,
    start: `${date}T${pad(Math.floor(start / 60))}:${pad(start % 60)}:00`,
  };
}
