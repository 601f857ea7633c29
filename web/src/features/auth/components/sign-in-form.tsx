import { useState, type FormEvent } from "react";
import { Link } from "react-router-dom";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TextField } from "../../../components/ui/field";
import { paths } from "../../../config/paths";
import type { Session } from "../../../lib/auth";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { SignInRequestSchema, useSignIn } from "../api/sign-in";

export function SignInForm({ defaultEmail = "", onSuccess }: { defaultEmail?: string; onSuccess: (session: Session) => void }) {
  const signIn = useSignIn();
  const [errors, setErrors] = useState<FieldErrors>({});

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = validate(SignInRequestSchema, { email: form.get("email"), password: form.get("password") });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(event.currentTarget, parsed.errors);
      return;
    }
    setErrors({});
    signIn.mutate(parsed.data, { onSuccess });
  }

  return (
    <form noValidate onSubmit={handleSubmit} onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))} className="flex flex-col gap-4" aria-label="Sign in">
      {signIn.isError ? <ErrorBanner error={signIn.error} /> : null}
      <TextField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="username"
        defaultValue={defaultEmail}
        error={errors.email}
        required
        autoFocus
      />
      <TextField
        label="Password"
        name="password"
        type="password"
        autoComplete="current-password"
        error={errors.password}
        required
      />
      <div className="flex items-center justify-between gap-3 pt-1">
        <Link
          to={paths.auth.forgotPassword.getHref()}
          className="text-[0.8125rem] text-ink-soft underline decoration-rule-strong underline-offset-2 hover:text-ink"
        >
          Forgot your password?
        </Link>
        <Button type="submit" variant="primary" busy={signIn.isPending}>
          Sign in
        </Button>
      </div>
    </form>
  );
}
