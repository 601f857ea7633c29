import type { GraphOptions, GraphOptionsInput } from "#contracts/graphs";
import { Checkbox, RadioGroup } from "../../../components/ui/choice";
import { SelectField, TextField } from "../../../components/ui/field";
import type { FieldErrors } from "../../../lib/form";

const HEADER_OPTIONS = [
  { value: "auto", label: "Detect" },
  { value: "yes", label: "First line is a header" },
  { value: "no", label: "No header" },
];

const DELIMITER_OPTIONS = [
  { value: "auto", label: "Detect" },
  { value: ",", label: "Comma ( , )" },
  { value: "tab", label: "Tab" },
  { value: "space", label: "Spaces" },
];

const DELIMITERS = { auto: "auto", ",": ",", tab: "\t", space: " " } as const;

function headerValue(header: GraphOptions["header"]): string {
  return header === "auto" ? "auto" : header ? "yes" : "no";
}

function delimiterValue(delimiter: GraphOptions["delimiter"]): string {
  return delimiter === "\t" ? "tab" : delimiter === " " ? "space" : delimiter;
}

/** Reads the fields below back into the options object the API takes (unvalidated: the schema checks it). */
export function readGraphOptions(form: FormData): GraphOptionsInput & { maxBadLines: unknown } {
  const header = String(form.get("header") ?? "auto");
  const delimiter = String(form.get("delimiter") ?? "auto");
  const badLines = String(form.get("maxBadLines") ?? "").trim();
  return {
    header: header === "yes" ? true : header === "no" ? false : "auto",
    delimiter: delimiter in DELIMITERS ? DELIMITERS[delimiter as keyof typeof DELIMITERS] : "auto",
    directed: form.get("direction") !== "undirected",
    weighted: form.get("weighted") === "on",
    selfLoops: form.get("selfLoops") === "keep" ? "keep" : "drop",
    duplicates: form.get("duplicates") === "keep" ? "keep" : "merge",
    maxBadLines: badLines === "" ? 0 : Number(badLines),
  };
}

/** How to read an edge list; the same fields serve a new graph and a retry with fixed options. */
export function GraphOptionsFields({ defaults, errors }: { defaults: GraphOptions; errors: FieldErrors }) {
  return (
    <div className="grid gap-x-5 gap-y-4 md:grid-cols-2">
      <SelectField label="Header row" name="header" options={HEADER_OPTIONS} defaultValue={headerValue(defaults.header)} />
      <SelectField
        label="Delimiter"
        name="delimiter"
        options={DELIMITER_OPTIONS}
        defaultValue={delimiterValue(defaults.delimiter)}
        hint="Detect reads the first lines; runs of spaces count as one."
      />
      <RadioGroup
        legend="Edges are"
        name="direction"
        defaultValue={defaults.directed ? "directed" : "undirected"}
        options={[
          { value: "directed", label: "Directed", hint: "source → target" },
          { value: "undirected", label: "Undirected", hint: "each line adds both directions" },
        ]}
      />
      <Checkbox
        name="weighted"
        defaultChecked={defaults.weighted}
        label="Use the third column as edge weight"
        hint="Finite and non-negative; without it every edge weighs 1."
        className="md:pt-6"
      />
      <SelectField
        label="Self-loops"
        name="selfLoops"
        defaultValue={defaults.selfLoops}
        hint="An edge from a node to itself."
        options={[
          { value: "drop", label: "Drop (counted)" },
          { value: "keep", label: "Keep" },
        ]}
      />
      <SelectField
        label="Duplicate edges"
        name="duplicates"
        defaultValue={defaults.duplicates}
        options={[
          { value: "merge", label: "Merge, sum weights" },
          { value: "keep", label: "Keep every copy" },
        ]}
      />
      <TextField
        label="Bad lines allowed"
        name="maxBadLines"
        type="number"
        inputMode="numeric"
        min={0}
        step={1}
        defaultValue={String(defaults.maxBadLines)}
        error={errors.options ?? errors.maxBadLines}
        hint="Lines that cannot be read are skipped up to this count; past it the graph is rejected. 0 rejects at the first one."
        fieldClassName="md:col-span-2 md:max-w-md"
      />
    </div>
  );
}
