import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { SelectField } from "../../../components/ui/field";

export type RunChoice = { id: number; label: string };

type ComparePickerProps = {
  runs: RunChoice[];
  a: number | null;
  b: number | null;
  onCompare: (a: number, b: number) => void;
};

export function ComparePicker({ runs, a, b, onCompare }: ComparePickerProps) {
  const [first, setFirst] = useState(a ? String(a) : "");
  const [second, setSecond] = useState(b ? String(b) : "");
  const [error, setError] = useState<string | null>(null);
  const options = [{ value: "", label: "Choose a run…" }, ...runs.map((r) => ({ value: String(r.id), label: r.label }))];
  // A run given in the address but not among the finished runs listed still has to show up in its picker.
  for (const id of [a, b]) if (id && !runs.some((r) => r.id === id)) options.push({ value: String(id), label: `Run #${id}` });

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (!first || !second) return setError("Choose two runs.");
    if (first === second) return setError("Choose two different runs.");
    setError(null);
    onCompare(Number(first), Number(second));
  }

  return (
    <form noValidate aria-label="Choose two runs" onSubmit={handleSubmit} className="flex flex-col gap-2">
      <div className="flex flex-wrap items-start gap-3">
        <SelectField label="Run A (before)" name="a" value={first} onChange={(e) => setFirst(e.target.value)} options={options} fieldClassName="min-w-72 flex-1" />
        <SelectField label="Run B (after)" name="b" value={second} onChange={(e) => setSecond(e.target.value)} options={options} fieldClassName="min-w-72 flex-1" />
        <Button type="submit" variant="primary" className="mt-[1.375rem]">
          Compare
        </Button>
      </div>
      {error ? (
        <p role="alert" className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </form>
  );
}
