import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TextField } from "../../../components/ui/field";
import { Loading } from "../../../components/ui/loading";
import { ROLE_LABELS, type Session } from "../../../lib/auth";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { AcceptInviteSchema, useAcceptInvite } from "../api/accept-invite";
import { useInvite } from "../api/get-invite";

export function AcceptInviteForm({ token, onAccepted }: { token: string; onAccepted: (session: Session) => void }) {
  const invite = useInvite(token);
  const accept = useAcceptInvite();
  const [errors, setErrors] = useState<FieldErrors>({});

  if (invite.isPending) return <Loading label="Checking the invitation…" />;
  if (invite.isError) return <ErrorBanner error={invite.error} title="This invitation cannot be used" />;

  const { email, role, team, existingAccount } = invite.data;

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    // An existing account keeps its name; the server ignores the field then.
    const name = existingAccount ? email : form.get("name");
    const parsed = validate(AcceptInviteSchema, { name, password: form.get("password") });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(event.currentTarget, parsed.errors);
      return;
    }
    setErrors({});
    accept.mutate({ token, ...parsed.data }, { onSuccess: onAccepted });
  }

  return (
    <form noValidate onSubmit={handleSubmit} onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))} className="flex flex-col gap-4" aria-label="Accept the invitation">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-md bg-paper-sunken px-3 py-2.5 text-[0.8125rem]">
        <dt className="text-ink-muted">E-mail</dt>
        <dd className="truncate font-medium text-ink">{email}</dd>
        <dt className="text-ink-muted">Team</dt>
        <dd className="font-medium text-ink">{team.name}</dd>
        <dt className="text-ink-muted">Role</dt>
        <dd className="font-medium text-ink">{ROLE_LABELS[role]}</dd>
      </dl>
      {accept.isError ? <ErrorBanner error={accept.error} /> : null}
      {existingAccount ? null : (
        <TextField label="Your name" name="name" autoComplete="name" error={errors.name} required autoFocus />
      )}
      <TextField
        label={existingAccount ? "Your current password" : "Choose a password"}
        name="password"
        type="password"
        autoComplete={existingAccount ? "current-password" : "new-password"}
        hint={existingAccount ? "You already have an account; confirm it is you." : "At least 10 characters."}
        error={errors.password}
        required
        autoFocus={existingAccount}
      />
      <Button type="submit" variant="primary" busy={accept.isPending} className="self-end">
        Join {team.name}
      </Button>
    </form>
  );
}
