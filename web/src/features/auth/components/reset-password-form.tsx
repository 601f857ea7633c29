import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TextField } from "../../../components/ui/field";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { PasswordSchema, useResetPassword } from "../api/reset-password";

const ResetFormSchema = z
  .object({ password: PasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

export function ResetPasswordForm({ token, onSuccess }: { token: string; onSuccess: () => void }) {
  const reset = useResetPassword();
  const [errors, setErrors] = useState<FieldErrors>({});

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = validate(ResetFormSchema, { password: form.get("password"), confirm: form.get("confirm") });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(event.currentTarget, parsed.errors);
      return;
    }
    setErrors({});
    reset.mutate({ token, password: parsed.data.password }, { onSuccess });
  }

  return (
    <form noValidate onSubmit={handleSubmit} onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))} className="flex flex-col gap-4" aria-label="Choose a new password">
      {reset.isError ? <ErrorBanner error={reset.error} /> : null}
      <TextField
        label="New password"
        name="password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters."
        error={errors.password}
        required
        autoFocus
      />
      <TextField
        label="Repeat new password"
        name="confirm"
        type="password"
        autoComplete="new-password"
        error={errors.confirm}
        required
      />
      <Button type="submit" variant="primary" busy={reset.isPending} className="self-end">
        Save password
      </Button>
    </form>
  );
}
