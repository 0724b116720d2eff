/**
 * What closing the window does. With no unsaved changes it closes; otherwise the user was asked
 * (button 0 "Keep Working", button 1 "Close and Discard Changes"). Any answer other than an explicit
 * discard keeps the window open: losing work must take a deliberate click.
 */
export type CloseDecision = 'close' | 'stay' | 'discard';

export function closeDecision(dirty: boolean, choice: number | null): CloseDecision {
  if (!dirty) return 'close';
  return choice === 1 ? 'discard' : 'stay';
}
