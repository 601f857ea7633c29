import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TextField } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { formatCount, formatPercent, formatScore } from "../../../lib/format";
import { useNodeRank } from "../api/get-node-rank";

/** "Where does node X rank?" over every node of the run, not only the top-k. */
export function NodeLookup({ runId }: { runId: number }) {
  const [text, setText] = useState("");
  const [asked, setAsked] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const lookup = useNodeRank(runId, asked);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const nodeId = text.trim();
    if (!nodeId) {
      setError("Enter a node id as it appears in the edge list.");
      return;
    }
    setError(null);
    setAsked(nodeId);
  }

  const notFound = lookup.error instanceof ApiError && lookup.error.status === 404;
  return (
    <div className="flex flex-col gap-3">
      <form role="search" aria-label="Find a node's rank" noValidate onSubmit={handleSubmit} className="flex flex-wrap items-start gap-3">
        <TextField
          label="Where does node… rank?"
          name="nodeId"
          value={text}
          onChange={(event) => {
            setText(event.target.value);
            setError(null);
          }}
          placeholder="https://harbour.kestrel.example/moorings"
          error={error}
          className="num"
          fieldClassName="min-w-72 flex-1"
          autoComplete="off"
        />
        <Button type="submit" className="mt-[1.375rem]" busy={lookup.isFetching}>
          Find rank
        </Button>
      </form>
      <div aria-live="polite">
        {asked && lookup.data ? (
          <p className="rounded-md border border-rule bg-paper-sunken px-3 py-2 text-sm text-ink">
            Node <span className="num font-medium break-all">{lookup.data.nodeId}</span> ranks{" "}
            <strong className="num font-semibold">{formatCount(lookup.data.rank)}</strong> of <span className="num">{formatCount(lookup.data.of)}</span>{" "}
            (top <span className="num">{formatPercent(lookup.data.rank / Math.max(1, lookup.data.of), 2)}</span>) with score{" "}
            <span className="num">{formatScore(lookup.data.score)}</span>.
          </p>
        ) : null}
        {asked && notFound ? (
          <p role="alert" className="rounded-md border border-amber bg-amber-soft/60 px-3 py-2 text-sm text-ink">
            There is no node <span className="num font-medium break-all">{asked}</span> in this run&apos;s graph. Ids match exactly, as written in the
            edge list.
          </p>
        ) : null}
        {lookup.isError && !notFound ? <ErrorBanner error={lookup.error} title="The lookup failed" /> : null}
      </div>
    </div>
  );
}
