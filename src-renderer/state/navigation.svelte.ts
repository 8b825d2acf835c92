export const screens = [
  { id: 'data', name: 'Data', key: '1' },
  { id: 'review', name: 'Review', key: '2' },
  { id: 'checks', name: 'Checks', key: '3' },
  { id: 'signoff', name: 'Sign-off', key: '4' },
  { id: 'history', name: 'History', key: '5' },
  { id: 'changes', name: 'Changes', key: '6' },
] as const;

export type ScreenId = (typeof screens)[number]['id'];

class Navigation {
  screen = $state<ScreenId>('review');
  shortcutsOpen = $state(false);

  go(screen: ScreenId): void {
    this.screen = screen;
  }
}

export const navigation = new Navigation();

/** The keyboard shortcuts, as listed in the app. */
export const shortcuts: { keys: string; does: string }[] = [
  { keys: 'Alt+1 … Alt+6', does: 'Go to Data, Review, Checks, Sign-off, History, Changes' },
  { keys: 'Ctrl+S / Ctrl+Shift+S', does: 'Save the study / save it under a new name' },
  { keys: 'Ctrl+Z', does: 'Undo the last decision' },
  { keys: 'Ctrl+Shift+Z or Ctrl+Y', does: 'Redo' },
  { keys: '← → (on the chart or table)', does: 'Select the previous or next period' },
  { keys: 'Home / End (on the chart)', does: 'Select the first or last period' },
  { keys: 'X', does: 'Exclude the selected period (asks for the assignable cause)' },
  { keys: 'R', does: 'Reinstate the selected period' },
  { keys: 'N', does: 'Start a new segment at the selected period (asks for the process change)' },
  { keys: 'S', does: 'Switch between the plotted and the standardized view' },
  { keys: '?', does: 'Show or hide this list' },
  { keys: 'Esc', does: 'Close a dialog or form' },
];
