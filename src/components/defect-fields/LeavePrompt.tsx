/**
 * The in-app question when a link is clicked while a form of the page holds unsaved edits: stay, or leave
 * without saving. Any island may render it; one of them (the first mounted) shows it. The store and the
 * reload/Back guard are in ./unsaved.ts.
 */
import { Dialog } from '@/components/ui/Dialog';
import { leaveNow, stayHere, useLeaveHost, useUnsavedSnapshot } from './unsaved';

/** Words for a list of form names: "a", "a and b", "a, b and c". */
export function listWords(names: string[]): string {
  return names.length <= 1 ? (names[0] ?? '') : `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}
const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** The leave question (renders nothing until it is needed). */
export function LeavePrompt() {
  const isHost = useLeaveHost();
  const snap = useUnsavedSnapshot();
  if (!isHost || !snap.pendingHref) return null;
  return (
    <Dialog
      open
      size="sm"
      onClose={stayHere}
      title="Leave without saving?"
      footer={
        <>
          <button type="button" className="btn-secondary" onClick={leaveNow}>
            Leave without saving
          </button>
          <button type="button" className="btn-primary" onClick={stayHere}>
            Stay on this page
          </button>
        </>
      }
    >
      <p className="text-[15px] text-ink-800" data-testid="leave-prompt">
        {snap.dirtyLabels.length ? (
          <>
            <span className="font-semibold">{capital(listWords(snap.dirtyLabels))}</span> {snap.dirtyLabels.length === 1 ? 'has' : 'have'} changes that are not saved yet. If you leave now, they are lost.
          </>
        ) : (
          'Nothing is waiting to be saved any more.'
        )}
      </p>
    </Dialog>
  );
}
