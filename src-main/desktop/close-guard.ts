/**
 * What closing the window does with unsaved changes. The window stays open unless the study is
 * saved or the user chose to discard; a save the user cancels keeps the window open.
 */
export const closePrompt = {
  type: 'warning' as const,
  title: 'Unsaved changes',
  message: 'This study has changes that are not saved.',
  detail: 'An autosave copy is kept for recovery, but it is not the study file.',
  buttons: ['Save…', 'Discard changes', 'Keep working'],
  defaultId: 0,
  cancelId: 2,
  noLink: true,
};

export type CloseChoice = 'save' | 'discard' | 'stay';

export function closeChoice(buttonIndex: number): CloseChoice {
  return buttonIndex === 0 ? 'save' : buttonIndex === 1 ? 'discard' : 'stay';
}
