/**
 * Uses a token from an e-mail link once the visitor presses the button (never on page load: mail scanners open
 * links, and a GET must not change anything). Kinds: confirm an address, accept an invitation.
 */
import { useState } from "react";
import { api, ApiClientError } from "../../lib/client/api";
import { FormMessage, buttonClass } from "./fields";

export default function TokenAction({ kind, token, signedIn }: { kind: "verify" | "invitation"; token: string | null; signedIn: boolean }) {
  const [state, setState] = useState<{ status: "idle" | "busy" | "ok" | "error"; message?: string; href?: string }>({ status: "idle" });
  if (!token) return <FormMessage>This link has no token: open the link from the e-mail again.</FormMessage>;
  if (kind === "invitation" && !signedIn) {
    const next = encodeURIComponent(`/invitations/accept?token=${token}`);
    return (
      <FormMessage>
        Sign in with the address the invitation was sent to, then come back here. <a className="font-medium text-brass" href={`/sign-in?next=${next}`}>Sign in</a> ·{" "}
        <a className="font-medium text-brass" href={`/sign-up?next=${next}`}>Create an account</a>
      </FormMessage>
    );
  }
  const run = async () => {
    setState({ status: "busy" });
    try {
      if (kind === "verify") {
        await api.verifyEmail(token);
        setState({ status: "ok", message: "Your e-mail address is confirmed.", href: "/library" });
      } else {
        const r = await api.acceptInvitation(token);
        setState({ status: "ok", message: `You joined the groove as ${r.role}.`, href: `/grooves/${r.grooveId}` });
      }
    } catch (e) {
      setState({ status: "error", message: e instanceof ApiClientError ? e.message : "Something went wrong: try again." });
    }
  };
  if (state.status === "ok")
    return (
      <FormMessage tone="ok">
        {state.message} <a href={state.href} className="font-medium text-brass">Continue</a>
      </FormMessage>
    );
  return (
    <div className="flex flex-col gap-4">
      {state.status === "error" && <FormMessage>{state.message}</FormMessage>}
      <button type="button" className={buttonClass} onClick={run} disabled={state.status === "busy"}>
        {kind === "verify" ? "Confirm my address" : "Accept the invitation"}
      </button>
    </div>
  );
}
