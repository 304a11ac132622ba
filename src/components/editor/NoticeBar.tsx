/**
 * The notice bar: what the last edit could not keep (listed one by one, with Undo), plain news, and
 * refused edits. Announced politely to screen readers.
 */
import { useActions, useEditor } from "./context";

export function NoticeBar() {
  const notice = useEditor((s) => s.notice);
  const actions = useActions();
  return (
    <div className="tx-noticeslot" aria-live="polite" role="status">
      {notice && (
        <div className={`tx-notice is-${notice.tone}`} key={notice.id}>
          <p className="tx-notice-title">{notice.title}</p>
          {notice.lines.length > 0 && (
            <ul className="tx-notice-lines">
              {notice.lines.slice(0, 12).map((l, i) => (
                <li key={i}>{l}</li>
              ))}
              {notice.lines.length > 12 && <li className="tx-dim">…and {notice.lines.length - 12} more</li>}
            </ul>
          )}
          <div className="tx-notice-actions">
            {notice.undoable && (
              <button
                type="button"
                className="tx-btn is-small"
                onClick={() => {
                  actions.undo();
                  actions.dismissNotice();
                }}
              >
                Undo
              </button>
            )}
            <button type="button" className="tx-btn is-small is-quiet" onClick={() => actions.dismissNotice()}>
              Dismiss
            </button>
          </div>
        </div>
      )}
    </div>
  );
}
