/** Sends the address-confirmation e-mail again (the server limits it to a few an hour). */
import { useState } from "react";
import { ApiClientError, api } from "../../lib/client/api";

export default function ResendVerification() {
  const [state, setState] = useState<{ busy: boolean; message: string }>({ busy: false, message: "" });
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <button
        type="button"
        className="font-medium text-brass underline-offset-2 hover:underline disabled:opacity-60"
        disabled={state.busy}
        onClick={async () => {
          setState({ busy: true, message: "" });
          try {
            await api.resendVerification();
            setState({ busy: false, message: "Sent: check your inbox." });
          } catch (e) {
            setState({ busy: false, message: e instanceof ApiClientError ? e.message : "Could not send it: try again later." });
          }
        }}
      >
        Send the link again
      </button>
      {state.message && <span role="status">{state.message}</span>}
    </span>
  );
}
