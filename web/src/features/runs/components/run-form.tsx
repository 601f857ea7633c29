import { useState, type FormEvent } from "react";
import { MAX_SHARDS, MAX_TOP_K, RunParametersSchema } from "#contracts/runs";
import { Button } from "../../../components/ui/button";
import { Checkbox, RadioGroup } from "../../../components/ui/choice";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { SelectField, TextField } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { focusFirstError, validate, type FieldErrors } from "../../../lib/form";
import { formatCount } from "../../../lib/format";
import { CreateRunSchema, useCreateRun } from "../api/create-run";
import { parseSeeds, unknownSeedIds } from "../lib/seeds";
import { SeedsField } from "./seeds-field";

const DEFAULTS = RunParametersSchema.parse({});

export type GraphChoice = { id: number; name: string; nodes: number | null; edges: number | null };

type RunFormProps = { graphs: GraphChoice[]; initialGraphId: number | null; onCreated: (runId: number) => void };

/** A number typed by a person: empty or unreadable text is an error of its own, not a silent default. */
function readNumber(form: FormData, name: string, errors: FieldErrors): number | undefined {
  const text = String(form.get(name) ?? "").trim();
  const value = Number(text);
  if (text === "" || !Number.isFinite(value)) {
    errors[name] = "Enter a number.";
    return undefined;
  }
  return value;
}

export function RunForm({ graphs, initialGraphId, onCreated }: RunFormProps) {
  const create = useCreateRun();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [damping, setDamping] = useState(String(DEFAULTS.damping));
  const [teleport, setTeleport] = useState<"uniform" | "seeds">("uniform");
  const [shardMode, setShardMode] = useState<"auto" | "fixed">("auto");
  const [seedsText, setSeedsText] = useState("");
  const unknown = create.error instanceof ApiError ? unknownSeedIds(create.error.details) : [];
  const dampingValue = Number(damping);
  const teleportShare = Number.isFinite(dampingValue) && dampingValue > 0 && dampingValue < 1 ? (1 - dampingValue).toFixed(4).replace(/0+$/, "").replace(/\.$/, "") : null;

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    const found: FieldErrors = {};
    const input = {
      graphId: form.get("graphId") ? Number(form.get("graphId")) : undefined,
      damping: readNumber(form, "damping", found),
      tolerance: readNumber(form, "tolerance", found),
      maxIterations: readNumber(form, "maxIterations", found),
      dangling: form.get("dangling") === "uniform" ? "uniform" : "teleport",
      teleport: { kind: "uniform" } as { kind: "uniform" } | { kind: "seeds"; seeds: unknown[] },
      weighted: form.get("weighted") === "on",
      shards: shardMode === "auto" ? "auto" : readNumber(form, "shardCount", found),
      topK: readNumber(form, "topK", found),
      notify: form.get("notify") === "on",
    };
    if (teleport === "seeds") {
      const parsed = parseSeeds(seedsText);
      if (parsed.errors.length) found.seeds = parsed.errors.slice(0, 3).join(" ");
      else if (parsed.seeds.length === 0) found.seeds = "Give at least one seed node, or choose uniform teleport.";
      input.teleport = { kind: "seeds", seeds: parsed.seeds };
    }
    const parsed = validate(CreateRunSchema, input);
    const all: FieldErrors = { ...(parsed.ok ? {} : parsed.errors), ...found };
    if (all.teleport && !all.seeds) all.seeds = all.teleport;
    if (all.shards && !all.shardCount) all.shardCount = all.shards;
    if (!parsed.ok || Object.keys(found).length) {
      setErrors(all);
      focusFirstError(formElement, all);
      return;
    }
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: ({ id }) => onCreated(id),
      onError: (error) => {
        if (error instanceof ApiError && unknownSeedIds(error.details).length) {
          formElement.querySelector<HTMLTextAreaElement>("textarea[name=seeds]")?.focus();
        }
      },
    });
  }

  const clear = (name: string) => setErrors(({ [name]: _dropped, ...rest }) => rest);
  const graphOptions = [
    { value: "", label: graphs.length ? "Choose a graph…" : "No graph is ready yet" },
    ...graphs.map((g) => ({ value: String(g.id), label: `${g.name} · ${formatCount(g.nodes)} nodes · ${formatCount(g.edges)} edges` })),
  ];

  return (
    <form
      noValidate
      aria-label="New ranking run"
      onSubmit={handleSubmit}
      onInput={(event) => {
        const target = event.target;
        if (target instanceof HTMLInputElement || target instanceof HTMLSelectElement || target instanceof HTMLTextAreaElement) clear(target.name);
      }}
      className="flex flex-col gap-5"
    >
      {create.isError && unknown.length === 0 ? <ErrorBanner error={create.error} title="The run was not submitted" /> : null}
      {unknown.length ? <ErrorBanner error={create.error} title="Some seed ids are not in this graph" /> : null}

      <SelectField label="Graph" name="graphId" defaultValue={initialGraphId ? String(initialGraphId) : ""} options={graphOptions} error={errors.graphId ? "Choose a ready graph." : null} />

      <fieldset className="grid gap-x-5 gap-y-4 md:grid-cols-3">
        <legend className="mb-2 text-xs font-semibold tracking-wider text-ink-muted uppercase">Iteration</legend>
        <TextField
          label="Damping factor"
          name="damping"
          inputMode="decimal"
          value={damping}
          onChange={(event) => setDamping(event.target.value)}
          error={errors.damping}
          className="num"
          hint={teleportShare ? <>Teleport probability = 1 − damping = <span className="num">{teleportShare}</span></> : "Between 0 and 1; teleport probability = 1 − damping."}
        />
        <TextField
          label="Tolerance (L1 residual)"
          name="tolerance"
          inputMode="decimal"
          defaultValue="1e-9"
          error={errors.tolerance}
          className="num"
          hint="Stop when ‖xₖ₊₁ − xₖ‖₁ falls below this."
        />
        <TextField
          label="Iteration cap"
          name="maxIterations"
          type="number"
          min={1}
          defaultValue={String(DEFAULTS.maxIterations)}
          error={errors.maxIterations}
          className="num"
          hint="A run that reaches it ends as not converged."
        />
      </fieldset>

      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-xs font-semibold tracking-wider text-ink-muted uppercase">Teleport and dangling nodes</legend>
        <RadioGroup
          legend="Teleport to"
          name="teleportKind"
          value={teleport}
          onChange={(value) => setTeleport(value === "seeds" ? "seeds" : "uniform")}
          options={[
            { value: "uniform", label: "Every node equally", hint: "uniform, 1/n each" },
            { value: "seeds", label: "Trusted seed nodes", hint: "personalized; link farms gain little" },
          ]}
        />
        {teleport === "seeds" ? <SeedsField value={seedsText} onChange={setSeedsText} error={errors.seeds} unknown={unknown} /> : null}
        <RadioGroup
          legend="Mass of dangling nodes goes to"
          name="dangling"
          defaultValue="teleport"
          options={[
            { value: "teleport", label: "The teleport vector", hint: "default" },
            { value: "uniform", label: "Every node equally", hint: "even with seeds" },
          ]}
        />
      </fieldset>

      <fieldset className="grid gap-x-5 gap-y-4 md:grid-cols-3">
        <legend className="mb-2 text-xs font-semibold tracking-wider text-ink-muted uppercase">Work and output</legend>
        <div className="flex flex-col gap-2">
          <RadioGroup
            legend="Shards"
            name="shardMode"
            value={shardMode}
            onChange={(value) => setShardMode(value === "fixed" ? "fixed" : "auto")}
            options={[
              { value: "auto", label: "Automatic" },
              { value: "fixed", label: "Fixed count" },
            ]}
          />
          {shardMode === "fixed" ? (
            <TextField label="Shard count" name="shardCount" type="number" min={1} max={MAX_SHARDS} defaultValue="4" error={errors.shardCount} className="num" hint={`1 to ${MAX_SHARDS}`} />
          ) : null}
        </div>
        <TextField
          label="Top-k size"
          name="topK"
          type="number"
          min={1}
          max={MAX_TOP_K}
          defaultValue={String(DEFAULTS.topK)}
          error={errors.topK}
          className="num"
          hint={`Positions kept for the results table, up to ${formatCount(MAX_TOP_K)}. Score files hold every node.`}
        />
        <div className="flex flex-col gap-3 md:pt-6">
          <Checkbox name="weighted" label="Use edge weights" hint="Only changes anything on a graph read with a weight column." />
          <Checkbox name="notify" label="E-mail me when done" hint="Also when it fails or needs attention." />
        </div>
      </fieldset>

      <div className="flex items-center gap-3 border-t border-rule pt-4">
        <Button type="submit" variant="primary" busy={create.isPending} disabled={graphs.length === 0}>
          Submit run
        </Button>
        <p className="text-xs text-ink-muted">The run is queued and picked up by the worker pool.</p>
      </div>
    </form>
  );
}
