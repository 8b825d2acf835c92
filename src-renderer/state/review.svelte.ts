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
  /** Index into study.iterations to compare with the current analysis, or null. */
  compareWith = $state<number | null>(null);
  /** The last message for assistive technology (announced politely). */
  announcement = $state('');

  selectNext(step: number): void {
    const count = study.result?.periods.length ?? 0;
    if (count === 0) return;
    const current = study.selected ?? (step > 0 ? -1 : count);
    study.selected = Math.min(count - 1, Math.max(0, current + step));
  }

  selectAt(position: number): void {
    const count = study.result?.periods.length ?? 0;
    if (count > 0) study.selected = Math.min(count - 1, Math.max(0, position));
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
