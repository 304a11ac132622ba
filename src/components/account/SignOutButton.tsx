/** Signs out and goes to the start page. */
import { useState } from "react";
import { api } from "../../lib/client/api";

export default function SignOutButton() {
  const [busy, setBusy] = useState(false);
  return (
    <button
      type="button"
      disabled={busy}
      className="rounded-md px-2 py-1.5 text-sm text-ink-soft hover:text-ink"
      onClick={async () => {
        setBusy(true);
        try {
          await api.signOut();
        } finally {
          location.assign("/");
        }
      }}
    >
      Sign out
    </button>
  );
}
