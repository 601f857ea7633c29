import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { ErrorBanner, Notice } from "../../../components/ui/error-banner";
import { TextField } from "../../../components/ui/field";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { PasswordResetRequestSchema, useRequestPasswordReset } from "../api/request-password-reset";

export function ForgotPasswordForm() {
  const request = useRequestPasswordReset();
  const [errors, setErrors] = useState<FieldErrors>({});

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = validate(PasswordResetRequestSchema, { email: new FormData(event.currentTarget).get("email") });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(event.currentTarget, parsed.errors);
      return;
    }
    setErrors({});
    request.mutate(parsed.data);
  }

  if (request.isSuccess) {
    return (
      <Notice>
        If that address belongs to a member, a reset link is on its way. The link works once and expires soon.
      </Notice>
    );
  }

  return (
    <form noValidate onSubmit={handleSubmit} onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))} className="flex flex-col gap-4" aria-label="Request a password reset">
      {request.isError ? <ErrorBanner error={request.error} /> : null}
      <TextField label="E-mail" name="email" type="email" autoComplete="username" error={errors.email} required autoFocus />
      <Button type="submit" variant="primary" busy={request.isPending} className="self-end">
        Send reset link
      </Button>
    </form>
  );
}
