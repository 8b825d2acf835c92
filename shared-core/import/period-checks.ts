import type { Observation } from '../study/analysis-types.js';
import type { ImportWarning } from './import-report.js';

/** Labels that name more than one period: such periods are referred to by `#ROW`. */
export function duplicateLabelWarnings(periods: Observation[], column: string): ImportWarning[] {
  const rowsByLabel = new Map<string, number[]>();
  for (const period of periods)
    rowsByLabel.set(period.label, [...(rowsByLabel.get(period.label) ?? []), period.row]);
  return [...rowsByLabel]
    .filter(([, rows]) => rows.length > 1)
    .map(([label, rows]) => ({
      code: 'duplicate-label',
      row: rows[1],
      column,
      message: `the label "${label}" names ${rows.length} periods (rows ${rows.join(', ')}); refer to them as ${rows.map((row) => `#${row}`).join(', ')}`,
    }));
}

/** Rows whose date is earlier than the row above them (they are put in date order). */
export function dateOrderWarnings(periods: Observation[], column: string): ImportWarning[] {
  const warnings: ImportWarning[] = [];
  for (let i = 1; i < periods.length; i++) {
    const [previous, current] = [periods[i - 1], periods[i]];
    if (current.date !== undefined && previous.date !== undefined && current.date < previous.date) {
      warnings.push({
        code: 'date-order',
        row: current.row,
        column,
        message: `${current.date} comes after ${previous.date} (row ${previous.row}); the periods are analysed in date order`,
      });
    }
  }
  return warnings;
}

const dayMs = 86_400_000;
const dayNumber = (date: string) => Math.round(Date.parse(`${date.slice(0, 10)}T00:00:00Z`) / dayMs);
const weekday = (day: number) => (((day + 4) % 7) + 7) % 7; // day 0 (1970-01-01) was a Thursday

function mode(values: number[]): number | undefined {
  const counts = new Map<number, number>();
  for (const value of values) counts.set(value, (counts.get(value) ?? 0) + 1);
  let best: number | undefined;
  for (const [value, count] of counts) if (best === undefined || count > counts.get(best)!) best = value;
  return best;
}

/**
 * Missing periods in a dated series: a step longer than the usual step between consecutive dates.
 * A daily series that never falls on a Saturday or Sunday is taken as working days (a weekend is
 * no gap); a series on the same day of each month is taken as monthly.
 */
export function dateGapWarnings(periods: Observation[], column: string): ImportWarning[] {
  const dated = periods.filter((period) => period.date !== undefined);
  if (dated.length < 3) return [];
  const days = dated.map((period) => dayNumber(period.date!));
  const monthly = new Set(dated.map((period) => period.date!.slice(8, 10))).size === 1;
  const positions = monthly
    ? dated.map((period) => Number(period.date!.slice(0, 4)) * 12 + Number(period.date!.slice(5, 7)))
    : days;
  const workingDays = days.every((day) => weekday(day) !== 0 && weekday(day) !== 6);
  const steps: number[] = [];
  for (let i = 1; i < dated.length; i++) steps.push(positions[i] - positions[i - 1]);
  const usual = mode(steps.filter((step) => step > 0));
  if (usual === undefined) return [];
  const warnings: ImportWarning[] = [];
  for (let i = 1; i < dated.length; i++) {
    const step = steps[i - 1];
    if (step <= usual) continue;
    if (!monthly && usual === 1 && workingDays) {
      let working = 0;
      for (let day = days[i - 1] + 1; day < days[i]; day++)
        if (weekday(day) !== 0 && weekday(day) !== 6) working++;
      if (working === 0) continue;
    }
    const unit = monthly ? 'month' : 'day';
    warnings.push({
      code: 'date-gap',
      row: dated[i].row,
      column,
      message: `no period between ${dated[i - 1].date} (row ${dated[i - 1].row}) and ${dated[i].date}: a gap of ${step} ${unit}s where the usual step is ${usual} ${unit}${usual === 1 ? '' : 's'}`,
    });
  }
  return warnings;
}
