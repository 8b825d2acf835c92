import { study } from './study.svelte.js';

/** The site's list of assignable-cause categories (editable in the exclusion form). */
export const defaultCauseCategories = [
  'Material',
  'Equipment',
  'Method',
  'Measurement',
  'People',
  'Environment',
  'Data entry',
];

class ReviewState {
  causeCategories = $state<string[]>([...defaultCauseCategories]);
  excludeFormOpen = $state(false);
  /** The form that starts a new segment at the selected period is open. */
  splitFormOpen = $state(false);
  /** The period whose split waits for the user to confirm its removal, or null. */
  confirmingRemoval = $state<number | null>(null);
  /** Index into study.iterations to compare with the current analysis, or null. */
  compareWith = $state<number | null>(null);
  /** The last message for assistive technology (announced politely). */
  announcement = $state('');

  selectNext(step: number): void {
    const count = study.chartPeriods.length;
    if (count === 0) return;
    const current = study.selected ?? (step > 0 ? -1 : count);
    study.selected = Math.min(count - 1, Math.max(0, current + step));
  }

  selectAt(position: number): void {
    const count = study.chartPeriods.length;
    if (count > 0) study.selected = Math.min(count - 1, Math.max(0, position));
  }

  /** Starts a new segment at `index` and says so; false (with study.lastProblem) when refused. */
  split(index: number, reason: string): boolean {
    if (!study.split(index, reason)) return false;
    const label = study.chartPeriods[index]?.label ?? `period ${index + 1}`;
    this.splitFormOpen = false;
    this.announce(`A new segment starts at ${label}. Each segment has its own limits now.`);
    return true;
  }

  /** Joins the segment starting at `index` to the one before it, once the user confirmed. */
  removeSplit(index: number): boolean {
    const label = study.splitOf(index)?.label ?? `period ${index + 1}`;
    this.confirmingRemoval = null;
    if (!study.removeSplit(index)) return false;
    this.announce(`The segment from ${label} is joined to the one before it. Limits recomputed.`);
    return true;
  }

  addCategory(name: string): void {
    const clean = name.trim();
    if (clean && !this.causeCategories.includes(clean))
      this.causeCategories = [...this.causeCategories, clean];
  }

  announce(message: string): void {
    this.announcement = message;
  }
}

export const review = new ReviewState();
