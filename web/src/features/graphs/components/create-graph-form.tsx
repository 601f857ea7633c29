import { useEffect, useState, type FormEvent } from "react";
import { GraphOptionsSchema, type GraphOptions } from "#contracts/graphs";
import type { Upload } from "#contracts/uploads";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { SelectField, TextField } from "../../../components/ui/field";
import { focusFirstError, validate, withoutEditedField, type FieldErrors } from "../../../lib/form";
import { formatBytes, formatDateTime } from "../../../lib/format";
import { CreateGraphSchema, useCreateGraph } from "../api/create-graph";
import { GraphOptionsFields, readGraphOptions } from "./graph-options-fields";

const DEFAULT_OPTIONS: GraphOptions = GraphOptionsSchema.parse({});

/** "kestrel-crawl.csv.gz" → "kestrel-crawl": a starting point for the graph's name. */
export function nameFromFile(filename: string): string {
  return filename.replace(/(\.(gz|gzip))$/i, "").replace(/\.(csv|tsv|txt|edges|el|tab|dat)$/i, "") || filename;
}

type CreateGraphFormProps = {
  uploads: Upload[];
  /** The upload to preselect, e.g. the one that just finished. */
  selectedUploadId: number | null;
  onCreated: (graphId: number) => void;
};

export function CreateGraphForm({ uploads, selectedUploadId, onCreated }: CreateGraphFormProps) {
  const create = useCreateGraph();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [uploadId, setUploadId] = useState<string>(String(selectedUploadId ?? uploads[0]?.id ?? ""));
  const chosen = uploads.find((u) => String(u.id) === uploadId) ?? null;
  const [name, setName] = useState(chosen ? nameFromFile(chosen.filename) : "");
  const [nameEdited, setNameEdited] = useState(false);

  useEffect(() => {
    if (selectedUploadId === null) return;
    setUploadId(String(selectedUploadId));
  }, [selectedUploadId]);

  useEffect(() => {
    if (!nameEdited) setName(chosen ? nameFromFile(chosen.filename) : "");
  }, [chosen, nameEdited]);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    const parsed = validate(CreateGraphSchema, {
      uploadId: uploadId ? Number(uploadId) : undefined,
      name: form.get("name"),
      options: readGraphOptions(form),
    });
    if (!parsed.ok) {
      setErrors(parsed.errors);
      focusFirstError(formElement, parsed.errors);
      return;
    }
    setErrors({});
    create.mutate(parsed.data, { onSuccess: ({ id }) => onCreated(id) });
  }

  const uploadOptions = uploads.map((u) => ({
    value: String(u.id),
    label: `${u.filename} · ${formatBytes(u.size)} · ${formatDateTime(u.completedAt ?? u.createdAt)}`,
  }));

  return (
    <form
      noValidate
      aria-label="Create a graph"
      onSubmit={handleSubmit}
      onInput={(event) => setErrors((current) => withoutEditedField(current, event.target))}
      className="flex flex-col gap-4"
    >
      {create.isError ? <ErrorBanner error={create.error} title="The graph was not created" /> : null}
      <div className="grid gap-x-5 gap-y-4 md:grid-cols-2">
        <SelectField
          label="Uploaded file"
          name="uploadId"
          value={uploadId}
          onChange={(event) => setUploadId(event.target.value)}
          options={uploadOptions}
          error={errors.uploadId ? "Choose a finished upload." : null}
          fieldClassName="md:col-span-2"
        />
        <TextField
          label="Graph name"
          name="name"
          value={name}
          onChange={(event) => {
            setName(event.target.value);
            setNameEdited(true);
          }}
          placeholder="kestrel-crawl-week-12"
          error={errors.name}
          autoComplete="off"
        />
      </div>
      <GraphOptionsFields defaults={DEFAULT_OPTIONS} errors={errors} />
      <div className="flex items-center gap-3 border-t border-rule pt-4">
        <Button type="submit" variant="primary" busy={create.isPending}>
          Create graph
        </Button>
        <p className="text-xs text-ink-muted">A worker reads the file and builds the graph; the report appears on the graph&apos;s page.</p>
      </div>
    </form>
  );
}
