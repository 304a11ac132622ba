/**
 * Tells the user where their unsaved work lives: restored from this browser, kept here until saved, or
 * (for a scratch groove) kept only here until they sign in and save.
 */
export interface DraftInfo {
  /** When the restored draft was written (ms), or null when nothing was restored. */
  restoredAt: number | null;
  scratch: boolean;
  /** The browser refused to store the draft (private mode, full storage). */
  storageFailed: boolean;
  /** The restored draft was made on an older version than the one now saved. */
  olderBase: boolean;
}

export function DraftBanner({ info, onDiscard }: { info: DraftInfo; onDiscard: () => void }) {
  if (info.storageFailed)
    return (
      <div className="tx-draft is-warn" role="status">
        This browser is not keeping a draft (storage is off or full): save a version before you leave the page.
      </div>
    );
  if (info.restoredAt === null) {
    if (!info.scratch) return null;
    return (
      <div className="tx-draft" role="status">
        This scratch groove is kept in this browser only. Sign in and save a version to keep it for good.
      </div>
    );
  }
  const when = new Date(info.restoredAt).toLocaleString(undefined, { dateStyle: "medium", timeStyle: "short" });
  return (
    <div className="tx-draft" role="status">
      <span>
        Restored your unsaved changes from <time dateTime={new Date(info.restoredAt).toISOString()}>{when}</time>.
        {info.olderBase && " They were made on an earlier version; someone has saved since, so saving will ask you to compare first."}
      </span>
      <button type="button" className="tx-btn is-small is-quiet" onClick={onDiscard}>
        {info.scratch ? "Start over" : "Discard them"}
      </button>
    </div>
  );
}
