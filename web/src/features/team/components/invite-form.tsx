import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { ErrorBanner, Notice } from "../../../components/ui/error-banner";
import { SelectField, TextField } from "../../../components/ui/field";
import { ROLE_OPTIONS } from "../../../lib/auth";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { CreateInviteSchema, useCreateInvite } from "../api/create-invite";

export function InviteForm() {
  const create = useCreateInvite();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [sentTo, setSentTo] = useState<string | null>(null);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    const parsed = validate(CreateInviteSchema, { email: form.get("email"), role: form.get("role") });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(event.currentTarget, parsed.errors);
      return;
    }
    setErrors({});
    setSentTo(null);
    create.mutate(parsed.data, {
      onSuccess: () => {
        setSentTo(parsed.data.email);
        formElement.reset();
      },
    });
  }

  return (
    <form noValidate onSubmit={handleSubmit} onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))} aria-label="Invite a member" className="flex flex-col gap-3">
      {create.isError ? <ErrorBanner error={create.error} title="The invitation was not sent" /> : null}
      {sentTo ? <Notice>Invitation sent to {sentTo}.</Notice> : null}
      <div className="flex flex-wrap items-start gap-3">
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="off"
          placeholder="name@kestrel.example"
          error={errors.email}
          fieldClassName="min-w-64 flex-1"
          required
        />
        <SelectField
          label="Role"
          name="role"
          options={ROLE_OPTIONS}
          defaultValue="viewer"
          fieldClassName="w-40"
          error={errors.role}
        />
        {/* Offset by the label's height so the button lines up with the inputs, with or without field errors. */}
        <Button type="submit" variant="primary" busy={create.isPending} className="mt-[1.375rem]">
          Send invitation
        </Button>
      </div>
    </form>
  );
}
