import { navigation, screens } from './navigation.svelte.js';
import { study } from './study.svelte.js';
import { review } from './review.svelte.js';
import { studyFile } from './study-file.svelte.js';

function typingInField(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  const tag = target.tagName;
  return tag === 'INPUT' || tag === 'TEXTAREA' || tag === 'SELECT' || target.isContentEditable;
}

/** The app-wide shortcuts listed under "Keys". Letters are ignored while typing in a field. */
export function handleGlobalKey(event: KeyboardEvent): void {
  if (event.altKey && !event.ctrlKey && !event.metaKey) {
    const screen = screens.find((s) => s.key === event.key);
    if (screen) {
      navigation.go(screen.id);
      event.preventDefault();
    }
    return;
  }
  const command = event.ctrlKey || event.metaKey;
  if (command && event.key.toLowerCase() === 's') {
    void studyFile.save(event.shiftKey);
    event.preventDefault();
    return;
  }
  if (command && !typingInField(event.target)) {
    const key = event.key.toLowerCase();
    if (key === 'z' && !event.shiftKey) study.undo();
    else if ((key === 'z' && event.shiftKey) || key === 'y') study.redo();
    else return;
    event.preventDefault();
    return;
  }
  if (event.key === 'Escape') {
    if (navigation.shortcutsOpen) navigation.shortcutsOpen = false;
    else if (review.excludeFormOpen) review.excludeFormOpen = false;
    else if (review.splitFormOpen) review.splitFormOpen = false;
    else if (review.confirmingRemoval !== null) review.confirmingRemoval = null;
    return;
  }
  if (command || event.altKey || typingInField(event.target)) return;
  if (event.key === '?') {
    navigation.shortcutsOpen = !navigation.shortcutsOpen;
    event.preventDefault();
    return;
  }
  if (navigation.screen !== 'review') return;
  const key = event.key.toLowerCase();
  const period = study.periodAt(study.selected);
  if (key === 's') study.view.standardized = !study.view.standardized;
  else if (key === 'x' && period && period.status !== 'excluded') {
    review.splitFormOpen = false;
    review.excludeFormOpen = true;
  } else if (key === 'r' && period && period.status === 'excluded') {
    study.reinstate(period.index);
    review.announce(`${period.label} reinstated. Limits recomputed.`);
  } else if (key === 'n' && period && period.index > 0 && !study.splitOf(period.index)) {
    review.excludeFormOpen = false;
    review.splitFormOpen = true;
  } else return;
  event.preventDefault();
}
