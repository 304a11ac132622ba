/** The sign-in form: e-mail and password; on success goes to ?next= or the library. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { api } from "../../lib/client/api";
import { Field, FormMessage, applyServerErrors, buttonClass, inputClass, nextPath } from "./fields";

const schema = z.object({
  email: z.string().trim().min(1, "Enter your e-mail address.").pipe(z.email({ message: "Enter a valid e-mail address." })),
  password: z.string().min(1, "Enter your password."),
});
type Values = z.infer<typeof schema>;

export default function SignInForm() {
  const form = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { email: "", password: "" } });
  const [formError, setFormError] = useState("");
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError("");
    try {
      await api.signIn(values);
      location.assign(nextPath());
    } catch (e) {
      setFormError(applyServerErrors(form, e, ["email", "password"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {formError && <FormMessage>{formError}</FormMessage>}
      <Field id="email" label="E-mail address" error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className={inputClass} aria-invalid={Boolean(errors.email)} {...form.register("email")} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        <input id="password" type="password" autoComplete="current-password" className={inputClass} aria-invalid={Boolean(errors.password)} {...form.register("password")} />
      </Field>
      <button type="submit" className={buttonClass} disabled={isSubmitting}>
        {isSubmitting ? "Signing in…" : "Sign in"}
      </button>
      <p className="text-sm text-ink-soft">
        <a href="/reset" className="text-brass">Forgot your password?</a> · New here? <a href="/sign-up" className="text-brass">Create an account</a>
      </p>
    </form>
  );
}
