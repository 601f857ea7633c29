import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { formatCount } from "../../../lib/format";
import type { GraphDetail } from "../api/get-graph";
import { RetryGraphSchema, useRetryGraph } from "../api/retry-graph";
import { GraphOptionsFields, readGraphOptions } from "./graph-options-fields";

/** Says exactly why the file was refused and offers to read the same upload again with other options. */
export function RejectionPanel({ graph, canRetry }: { graph: GraphDetail; canRetry: boolean }) {
  const rejection = graph.rejection;
  const [fixing, setFixing] = useState(false);
  const retry = useRetryGraph();
  const [errors, setErrors] = useState<FieldErrors>({});

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const parsed = validate(RetryGraphSchema, { options: readGraphOptions(new FormData(formElement)) });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(formElement, parsed.errors);
      return;
    }
    setErrors({});
    retry.mutate({ id: graph.id, ...parsed.data }, { onSuccess: () => setFixing(false) });
  }

  return (
    <div className="flex flex-col gap-4">
      <div role="alert" className="rounded-md border border-danger/40 bg-danger-soft px-4 py-3 text-sm text-danger">
        <p className="font-semibold">This file was not turned into a graph.</p>
        <p className="mt-1 text-ink">{rejection?.message ?? "The ingest stopped without a reason on record."}</p>
        {rejection ? (
          <p className="num mt-1.5 text-xs text-ink-soft">
            {rejection.file}
            {rejection.line ? `, line ${formatCount(rejection.line)}` : ""} · {rejection.code}
          </p>
        ) : null}
        <p className="mt-1.5 text-xs text-ink-soft">The uploaded file is kept, so it can be read again with other options.</p>
      </div>
      {canRetry ? (
        fixing ? (
          <form
            noValidate
            aria-label="Retry with other options"
            onSubmit={handleSubmit}
            onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))}
            className="flex flex-col gap-4 rounded-md border border-rule px-4 py-4"
          >
            {retry.isError ? <ErrorBanner error={retry.error} title="The retry was not queued" /> : null}
            <GraphOptionsFields defaults={graph.options} errors={errors} />
            <div className="flex gap-2">
              <Button type="submit" variant="primary" busy={retry.isPending}>
                Read the file again
              </Button>
              <Button variant="quiet" onClick={() => setFixing(false)}>
                Cancel
              </Button>
            </div>
          </form>
        ) : (
          <div>
            <Button variant="primary" onClick={() => setFixing(true)}>
              Fix options and retry
            </Button>
          </div>
        )
      ) : null}
    </div>
  );
}
