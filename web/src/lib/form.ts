import type { z } from "zod";

export type FieldErrors = Partial<Record<string, string>>;

/** Parses form values with a schema; on failure returns the first message per field. */
export function validate<S extends z.ZodType>(
  schema: S,
  values: unknown,
): { ok: true; data: z.infer<S> } | { ok: false; errors: FieldErrors } {
  const result = schema.safeParse(values);
  if (result.success) return { ok: true, data: result.data };
  const errors: FieldErrors = {};
  for (const issue of result.error.issues) {
    const key = issue.path.length ? String(issue.path[0]) : "form";
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}

/** Moves focus to the first field with an error, so keyboard and screen-reader users land on it. */
export function focusFirstError(form: HTMLFormElement, errors: FieldErrors): void {
  for (const element of Array.from(form.elements)) {
    const name = element.getAttribute("name");
    if (name && errors[name] && element instanceof HTMLElement) {
      element.focus();
      return;
    }
  }
}

/** The error of the field being edited is stale; drop it so the message does not contradict the input. */
export function withoutEditedField(errors: FieldErrors, target: EventTarget): FieldErrors {
  const name = target instanceof HTMLInputElement || target instanceof HTMLSelectElement ? target.name : "";
  if (!name || !errors[name]) return errors;
  const { [name]: _dropped, ...rest } = errors;
  return rest;
}
