/** Password reset: ask for a link (no token in the URL), or choose a new password (token from the e-mail link). */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { api } from "../../lib/client/api";
import { Field, FormMessage, applyServerErrors, buttonClass, inputClass } from "./fields";

const requestSchema = z.object({ email: z.string().trim().min(1, "Enter your e-mail address.").pipe(z.email({ message: "Enter a valid e-mail address." })) });
const setSchema = z
  .object({ password: z.string().min(8, "Use at least 8 characters.").max(256), confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

function RequestReset() {
  const form = useForm<z.infer<typeof requestSchema>>({ resolver: zodResolver(requestSchema), defaultValues: { email: "" } });
  const [message, setMessage] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async ({ email }) => {
    setMessage(null);
    try {
      const r = await api.requestReset(email);
      setMessage({ tone: "ok", text: r.message });
    } catch (e) {
      const text = applyServerErrors(form, e, ["email"]);
      if (text) setMessage({ tone: "error", text });
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Ask for a reset link">
      {message && <FormMessage tone={message.tone}>{message.text}</FormMessage>}
      <Field id="email" label="E-mail address of your account" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className={inputClass} aria-invalid={Boolean(errors.email)} {...form.register("email")} />
      </Field>
      <button type="submit" className={buttonClass} disabled={isSubmitting}>
        Send me a reset link
      </button>
    </form>
  );
}

function SetPassword({ token }: { token: string }) {
  const form = useForm<z.infer<typeof setSchema>>({ resolver: zodResolver(setSchema), defaultValues: { password: "", confirm: "" } });
  const [formError, setFormError] = useState("");
  const [done, setDone] = useState(false);
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async ({ password }) => {
    setFormError("");
    try {
      await api.resetPassword(token, password);
      setDone(true);
    } catch (e) {
      setFormError(applyServerErrors(form, e, ["password"]));
    }
  });
  if (done)
    return (
      <FormMessage tone="ok">
        Your password is changed and every other session of your account has ended. <a href="/library" className="font-medium text-brass">Go to your library</a>
      </FormMessage>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Choose a new password">
      {formError && <FormMessage>{formError} {formError.includes("not valid") && <a href="/reset" className="text-brass">Ask for a new link</a>}</FormMessage>}
      <Field id="password" label="New password" error={errors.password?.message} hint="At least 8 characters; very common passwords are refused.">
        <input id="password" type="password" autoComplete="new-password" className={inputClass} aria-invalid={Boolean(errors.password)} {...form.register("password")} />
      </Field>
      <Field id="confirm" label="The same password again" error={errors.confirm?.message}>
        <input id="confirm" type="password" autoComplete="new-password" className={inputClass} aria-invalid={Boolean(errors.confirm)} {...form.register("confirm")} />
      </Field>
      <button type="submit" className={buttonClass} disabled={isSubmitting}>
        Set the new password
      </button>
    </form>
  );
}

export default function ResetForms({ token }: { token: string | null }) {
  return token ? <SetPassword token={token} /> : <RequestReset />;
}
