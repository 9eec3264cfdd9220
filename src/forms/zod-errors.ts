// A zod failure as one message per form field (dotted path), the way the form fields show them,
// with plain words for a field that holds no number at all.
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

export type ParseResult<T> = { ok: true; value: T } | { ok: false; errors: FieldErrors };

export function fieldErrors(error: z.ZodError): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join('.') || 'form';
    errors[key] ??= issue.message;
  }
  return errors;
}

// Schema messages ("At least 10 minutes.") win; only zod's generic type messages are replaced.
const plainWords: z.core.$ZodErrorMap = (issue) => {
  if (issue.code !== 'invalid_type') return undefined;
  if (issue.expected === 'int') return 'Enter a whole number.';
  if (issue.expected === 'number') return 'Enter a number.';
  return undefined;
};

/** Parse form values with a shared schema; errors keyed by field path. */
export function parseForm<S extends z.ZodType>(schema: S, values: unknown): ParseResult<z.infer<S>> {
  const parsed = schema.safeParse(values, { error: plainWords });
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, errors: fieldErrors(parsed.error) };
}

/** A text field's content as a number: '' and non-numbers become NaN, so zod reports them. */
export function numberFrom(value: unknown): number {
  if (typeof value === 'number') return value;
  if (typeof value !== 'string' || value.trim() === '') return Number.NaN;
  return Number(value.trim());
}

/** Like numberFrom, but an empty field means "no value" (null), e.g. "use the class default". */
export function optionalNumberFrom(value: unknown): number | null {
  if (value === null || value === undefined || (typeof value === 'string' && value.trim() === '')) return null;
  return numberFrom(value);
}
