import { useId, type ChangeEvent } from "react";

type SeedsFieldProps = {
  value: string;
  onChange: (value: string) => void;
  error?: string | null;
  unknown: string[];
};

const SHOWN_UNKNOWN = 12;

/** Seed list as `id[,weight]` lines, typed, pasted or read from a local file. */
export function SeedsField({ value, onChange, error, unknown }: SeedsFieldProps) {
  const id = useId();
  const describedBy = [`${id}-hint`, error ? `${id}-error` : null, unknown.length ? `${id}-unknown` : null].filter(Boolean).join(" ");

  async function readFile(event: ChangeEvent<HTMLInputElement>) {
    const file = event.target.files?.[0];
    if (!file) return;
    onChange(await file.text());
    event.target.value = "";
  }

  return (
    <div className="flex flex-col gap-1">
      <div className="flex items-end justify-between gap-3">
        <label htmlFor={id} className="text-[0.8125rem] font-medium text-ink-soft">
          Seed nodes
        </label>
        <label className="cursor-pointer text-xs font-medium text-ink underline decoration-rule-strong underline-offset-2 focus-within:outline-2 focus-within:outline-amber-strong hover:decoration-ink">
          Load from a file…
          <input type="file" accept=".csv,.tsv,.txt,text/plain,text/csv" className="sr-only" onChange={readFile} aria-label="Load seed nodes from a file" />
        </label>
      </div>
      <textarea
        id={id}
        name="seeds"
        rows={6}
        value={value}
        onChange={(event) => onChange(event.target.value)}
        aria-describedby={describedBy}
        aria-invalid={Boolean(error || unknown.length) || undefined}
        spellCheck={false}
        placeholder={"https://council.kestrel.example/,2\nhttps://ferries.kestrel.example/timetable\nhttps://museum.kestrel.example/,0.5"}
        className="num block w-full rounded-md border border-rule-strong bg-paper-raised px-2.5 py-2 text-[0.8125rem] text-ink placeholder:text-ink-muted/70 hover:border-ink-muted aria-[invalid=true]:border-danger"
      />
      <p id={`${id}-hint`} className="text-xs text-ink-muted">
        One original node id per line, optionally followed by a comma and a positive weight (default 1). Weights are
        normalized to sum 1; teleport lands only on these nodes. Lines starting with # are ignored.
      </p>
      {error ? (
        <p id={`${id}-error`} className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
      {unknown.length ? (
        <div id={`${id}-unknown`} className="text-xs font-medium text-danger">
          {unknown.length === 1 ? "This id is" : `These ${unknown.length} ids are`} not in the graph:{" "}
          <span className="num font-normal">
            {unknown.slice(0, SHOWN_UNKNOWN).join(", ")}
            {unknown.length > SHOWN_UNKNOWN ? `, and ${unknown.length - SHOWN_UNKNOWN} more` : ""}
          </span>
        </div>
      ) : null}
    </div>
  );
}
