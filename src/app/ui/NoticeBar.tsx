/** A message line for errors (the InputError text names file and place) and notes. */
import { useViewer } from '../state/store.ts';

export function NoticeBar() {
  const notice = useViewer((s) => s.notice);
  const busy = useViewer((s) => s.busy);
  const set = useViewer((s) => s.set);
  return (
    <div className="notices" aria-live="polite">
      {busy && <div className="notice info">{busy}</div>}
      {notice && (
        <div className={`notice ${notice.kind}`} role={notice.kind === 'error' ? 'alert' : 'status'} data-testid={`notice-${notice.kind}`}>
          <span>{notice.text}</span>
          <button type="button" className="link" onClick={() => set({ notice: null })} aria-label="Dismiss message">✕</button>
        </div>
      )}
    </div>
  );
}
