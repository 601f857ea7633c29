import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TextField } from "../../../components/ui/field";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { CreateTokenSchema, useCreateToken, type CreatedToken } from "../api/create-token";

export function CreateTokenForm() {
  const create = useCreateToken();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [created, setCreated] = useState<CreatedToken | null>(null);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const parsed = validate(CreateTokenSchema, { name: new FormData(formElement).get("name") });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(event.currentTarget, parsed.errors);
      return;
    }
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: (token) => {
        setCreated(token);
        formElement.reset();
      },
    });
  }

  return (
    <div className="flex flex-col gap-4">
      {created ? <NewTokenNotice token={created} onDismiss={() => setCreated(null)} /> : null}
      <form noValidate onSubmit={handleSubmit} onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))} aria-label="Create an API token" className="flex flex-col gap-3">
        {create.isError ? <ErrorBanner error={create.error} title="The token was not created" /> : null}
        <div className="flex flex-wrap items-start gap-3">
          <TextField
            label="Token name"
            name="name"
            autoComplete="off"
            placeholder="nightly-score-export"
            hint="Say which script or pipeline will use it."
            error={errors.name}
            fieldClassName="min-w-64 flex-1"
            required
          />
          <Button type="submit" variant="primary" busy={create.isPending} className="mt-[1.375rem]">
            Create token
          </Button>
        </div>
      </form>
    </div>
  );
}

function NewTokenNotice({ token, onDismiss }: { token: CreatedToken; onDismiss: () => void }) {
  const [copied, setCopied] = useState<"idle" | "copied" | "failed">("idle");

  async function copy() {
    try {
      await navigator.clipboard.writeText(token.token);
      setCopied("copied");
    } catch {
      setCopied("failed");
    }
  }

  return (
    <section
      aria-labelledby="new-token-title"
      className="flex flex-col gap-2.5 rounded-md border border-amber bg-amber-soft/70 px-4 py-3"
    >
      <h3 id="new-token-title" className="font-semibold text-ink">
        Token “{token.name}” created
      </h3>
      <p role="alert" className="text-[0.8125rem] text-ink-soft">
        Copy it now: this is the only time it is shown. Store it in your secret manager; anyone holding it can act with
        your role.
      </p>
      <div className="flex flex-wrap items-center gap-2">
        <code
          aria-label="New API token"
          className="num min-w-0 flex-1 rounded-md border border-rule-strong bg-paper-raised px-2.5 py-1.5 text-[0.8125rem] break-all text-ink select-all"
        >
          {token.token}
        </code>
        <Button size="sm" variant="secondary" onClick={copy}>
          {copied === "copied" ? "Copied" : "Copy token"}
        </Button>
        <Button size="sm" variant="quiet" onClick={onDismiss}>
          I have stored it
        </Button>
      </div>
      <p aria-live="polite" className="text-xs text-ink-muted">
        {copied === "copied" ? "Token copied to the clipboard." : copied === "failed" ? "Copying failed; select the token and copy it by hand." : ""}
      </p>
    </section>
  );
}
