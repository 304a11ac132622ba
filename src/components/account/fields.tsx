/** Small form building blocks shared by the account and library forms (react-hook-form + zod). */
import type { ReactNode } from "react";
import type { FieldValues, Path, UseFormReturn } from "react-hook-form";
import { ApiClientError } from "../../lib/client/api";

export const inputClass =
  "w-full rounded-md border border-line-strong bg-surface-raised px-3 py-2 text-ink placeholder:text-ink-faint focus:border-brass focus:outline-none aria-[invalid=true]:border-danger";
export const buttonClass =
  "inline-flex items-center justify-center gap-2 rounded-lg bg-ink px-4 py-2 font-medium text-surface hover:bg-brass disabled:cursor-not-allowed disabled:opacity-60";
export const quietButtonClass =
  "inline-flex items-center justify-center gap-2 rounded-md border border-line-strong px-3 py-1.5 text-sm font-medium text-ink hover:border-brass hover:text-brass disabled:cursor-not-allowed disabled:opacity-50";

export function Field({ id, label, error, hint, children }: { id: string; label: string; error?: string; hint?: ReactNode; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint && !error && <p className="text-sm text-ink-faint">{hint}</p>}
      {error && (
        <p id={`${id}-error`} role="alert" className="text-sm text-danger">
          {error}
        </p>
      )}
    </div>
  );
}

/** A message above a form (the server's answer when it is not about one field). */
export function FormMessage({ tone = "error", children }: { tone?: "error" | "ok"; children: ReactNode }) {
  return (
    <div role={tone === "error" ? "alert" : "status"} className={`rounded-md border-l-4 px-3 py-2 text-sm ${tone === "error" ? "border-danger bg-surface-sunken text-ink" : "border-teal bg-teal-soft text-ink"}`}>
      {children}
    </div>
  );
}

/**
 * Puts the server's field errors on the form's fields; returns the message for the form itself.
 * @example catch (e) { setFormError(applyServerErrors(form, e, ["email", "password"])) }
 */
export function applyServerErrors<T extends FieldValues>(form: UseFormReturn<T>, error: unknown, fieldNames: Path<T>[]): string {
  if (!(error instanceof ApiClientError)) return "Something went wrong: try again.";
  let placed = false;
  for (const name of fieldNames) {
    const messages = error.fields[name];
    if (messages?.length) {
      form.setError(name, { type: "server", message: messages[0] });
      placed = true;
    }
  }
  if (error.status === 429) return error.message;
  return placed ? "" : error.message;
}

/** Where to go after signing in: a same-site path from ?next=, else the library. */
export function nextPath(): string {
  if (typeof location === "undefined") return "/library";
  const next = new URLSearchParams(location.search).get("next");
  return next && next.startsWith("/") && !next.startsWith("//") ? next : "/library";
}
