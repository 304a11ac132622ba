/** The sign-up form: name, e-mail, password (8+ characters, not a common one: the server checks the list). */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { api } from "../../lib/client/api";
import { Field, FormMessage, applyServerErrors, buttonClass, inputClass, nextPath } from "./fields";

const schema = z.object({
  displayName: z.string().trim().min(1, "Enter a name.").max(80, "Use at most 80 characters."),
  email: z.string().trim().min(1, "Enter your e-mail address.").pipe(z.email({ message: "Enter a valid e-mail address." })),
  password: z.string().min(8, "Use at least 8 characters.").max(256, "Use at most 256 characters."),
});
type Values = z.infer<typeof schema>;

export default function SignUpForm() {
  const form = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { displayName: "", email: "", password: "" } });
  const [formError, setFormError] = useState("");
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError("");
    try {
      await api.signUp(values);
      location.assign(nextPath());
    } catch (e) {
      setFormError(applyServerErrors(form, e, ["displayName", "email", "password"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Create an account">
      {formError && <FormMessage>{formError}</FormMessage>}
      <Field id="displayName" label="Your name" error={errors.displayName?.message} hint="Shown beside your versions and to people you share grooves with.">
        <input id="displayName" autoComplete="name" className={inputClass} aria-invalid={Boolean(errors.displayName)} {...form.register("displayName")} />
      </Field>
      <Field id="email" label="E-mail address" error={errors.email?.message} hint="We send a link to confirm it.">
        <input id="email" type="email" autoComplete="email" className={inputClass} aria-invalid={Boolean(errors.email)} {...form.register("email")} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message} hint="At least 8 characters. A few words you will remember work well; very common passwords are refused.">
        <input id="password" type="password" autoComplete="new-password" className={inputClass} aria-invalid={Boolean(errors.password)} {...form.register("password")} />
      </Field>
      <button type="submit" className={buttonClass} disabled={isSubmitting}>
        {isSubmitting ? "Creating…" : "Create account"}
      </button>
      <p className="text-sm text-ink-soft">
        Already have an account? <a href="/sign-in" className="text-brass">Sign in</a>
      </p>
    </form>
  );
}
