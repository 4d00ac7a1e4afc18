"use client";
// Every form of the app: react-hook-form with the zod resolver over the same request schema the
// route parses with (lib/api/schemas), so the browser says what the server would say before
// anything is sent. What only the server can know (a slug taken, a password too short for an
// invite that changed) comes back as located issues; each goes to its field, the rest above the
// buttons.
import { zodResolver } from "@hookform/resolvers/zod";
import type { ReactNode } from "react";
import { FormProvider, useForm, useFormContext, type DefaultValues, type FieldValues, type Path, type UseFormReturn } from "react-hook-form";
import type { z } from "zod";
import { Button } from "@/components/ui/Button";
import { FormError } from "@/components/ui/Field";
import type { ApiError, SendResult } from "@/lib/client/api";
import { parsePath } from "@/lib/issue-path";

// A form's values are always an object of fields.
type FormSchema = z.ZodType<FieldValues, FieldValues>;

export type ApiFormReturn<S extends FormSchema> = UseFormReturn<z.input<S>, unknown, z.output<S>>;

export function useApiForm<S extends FormSchema>(schema: S, defaultValues: DefaultValues<z.input<S>>): ApiFormReturn<S> {
  return useForm<z.input<S>, unknown, z.output<S>>({ resolver: zodResolver(schema), defaultValues, mode: "onTouched" });
}

/** Where the server's issues that name no field of the form go. */
export const SERVER_ERROR = "root.server" as const;

/**
 * A refused request, onto the form: an issue whose path (`body.name`, `query.confirm`,
 * `body.rules["top-k-review"].k`) names a field of the form goes beside it; everything else, and
 * the message when no issue names a field, goes to the form as a whole.
 */
function showServerError<T extends FieldValues>(form: UseFormReturn<T, unknown, unknown>, error: ApiError, messageFor?: (error: ApiError) => string | null): void {
  const values = form.getValues() as Record<string, unknown>;
  const elsewhere: string[] = [];
  let placed = 0;
  for (const issue of error.issues) {
    const segments = parsePath(issue.path) ?? [];
    const rest = segments[0] === "body" || segments[0] === "query" ? segments.slice(1) : segments;
    const name = rest.join(".");
    if (name && typeof rest[0] === "string" && rest[0] in values) {
      form.setError(name as Path<T>, { type: "server", message: issue.message });
      placed += 1;
    } else elsewhere.push(issue.path && issue.path !== "(root)" ? `${issue.path}: ${issue.message}` : issue.message);
  }
  const custom = messageFor?.(error);
  if (custom || elsewhere.length || placed === 0) {
    form.setError(SERVER_ERROR as Path<T>, { type: "server", message: custom ?? (elsewhere.length ? elsewhere.join("; ") : error.message) });
  }
}

/**
 * Submit handler: validate with the schema, send, then either `onDone` or the server's issues on
 * the fields. `messageFor` words a refusal for this form (e.g. a 404 as "no such component").
 */
export function submitWith<S extends FormSchema, R>(
  form: ApiFormReturn<S>,
  send: (values: z.output<S>) => Promise<SendResult<R>>,
  onDone: (data: R, values: z.output<S>) => void | Promise<void>,
  messageFor?: (error: ApiError) => string | null,
) {
  return form.handleSubmit(async (values) => {
    const result = await send(values);
    if (result.ok) await onDone(result.data, values);
    else showServerError(form, result.error, messageFor);
  });
}

/** The <form>: provides the form to its fields, never lets the browser's own validation speak first. */
export function ApiForm<S extends FormSchema>({
  form,
  onSubmit,
  label,
  className,
  children,
}: {
  form: ApiFormReturn<S>;
  onSubmit: (e?: React.BaseSyntheticEvent) => Promise<void>;
  label: string;
  className?: string;
  children: ReactNode;
}) {
  return (
    <FormProvider {...form}>
      <form noValidate aria-label={label} onSubmit={(e) => void onSubmit(e)} className={className}>
        {children}
      </form>
    </FormProvider>
  );
}

/** The form-wide error (what no field is about), where the form wants it. */
export function FormProblem({ className, id }: { className?: string; id?: string }) {
  const { formState } = useFormContext();
  const message = (formState.errors.root as { server?: { message?: string } } | undefined)?.server?.message;
  if (!message) return null;
  return (
    <div className={className}>
      <FormError id={id} message={message} />
    </div>
  );
}

/** The form's submit button: says it is working while the request is out. */
export function SubmitButton({
  children,
  working,
  variant = "primary",
  className,
  disabled,
  testId,
  label,
}: {
  children: ReactNode;
  working?: ReactNode;
  variant?: "primary" | "secondary" | "danger";
  className?: string;
  disabled?: boolean;
  testId?: string;
  /** the accessible name, when rows repeat the same button ("Claim print-spooler") */
  label?: string;
}) {
  const { formState } = useFormContext();
  return (
    <Button type="submit" variant={variant} className={className} disabled={disabled || formState.isSubmitting} data-testid={testId} aria-label={label}>
      {formState.isSubmitting && working ? working : children}
    </Button>
  );
}
