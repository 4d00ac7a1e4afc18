"use client";
// Fields of an ApiForm: a label, the control, a hint, and the field's own error beside it, wired
// for screen readers (aria-invalid, aria-describedby). A field left blank can mean "absent" (the
// request leaves it out) or "null" (the request clears it), as the route's schema wants.
import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";
import { get, useFormContext, type FieldError, type RegisterOptions } from "react-hook-form";
import { Label, Select, TextArea, TextInput } from "@/components/ui/Field";

type Blank = "keep" | "absent" | "null";

function blankAs(blank: Blank): RegisterOptions["setValueAs"] | undefined {
  if (blank === "keep") return undefined;
  return (v: unknown) => (typeof v === "string" && v.trim() === "" ? (blank === "null" ? null : undefined) : v);
}

interface FieldFrame {
  name: string;
  label: ReactNode;
  hint?: ReactNode;
  /** under the control, for what a label cannot say in a few words */
  help?: ReactNode;
  /** of the field (label, control, hint and error together) */
  className?: string;
  /** of the control alone (e.g. font-mono for names) */
  controlClassName?: string;
}

function useField(name: string) {
  const ctx = useFormContext();
  const error = get(ctx.formState.errors, name) as FieldError | undefined;
  return { ctx, error };
}

function Frame({ id, frame, error, children }: { id: string; frame: FieldFrame; error: FieldError | undefined; children: ReactNode }) {
  return (
    <div className={frame.className}>
      <Label htmlFor={id} hint={frame.hint}>
        {frame.label}
      </Label>
      {children}
      {frame.help && (
        <p id={`${id}-help`} className="mt-1 text-xs text-muted">
          {frame.help}
        </p>
      )}
      {error?.message && (
        <p id={`${id}-error`} className="mt-1 text-xs text-down" data-testid={`error-${frame.name}`}>
          {error.message}
        </p>
      )}
    </div>
  );
}

const described = (id: string, frame: FieldFrame, error: FieldError | undefined) =>
  [frame.help ? `${id}-help` : null, error?.message ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;

export function InputField({
  name,
  label,
  hint,
  help,
  className,
  controlClassName,
  blank = "keep",
  number = false,
  onChange,
  ...input
}: FieldFrame & { blank?: Blank; number?: boolean } & Omit<InputHTMLAttributes<HTMLInputElement>, "name" | "className">) {
  const id = useId();
  const frame = { name, label, hint, help, className };
  const { ctx, error } = useField(name);
  const options: RegisterOptions = number ? { valueAsNumber: true, onChange } : { setValueAs: blankAs(blank), onChange };
  return (
    <Frame id={id} frame={frame} error={error}>
      <TextInput id={id} className={controlClassName} {...input} {...ctx.register(name, options)} aria-invalid={error ? true : undefined} aria-describedby={described(id, frame, error)} />
    </Frame>
  );
}

export function TextAreaField({ name, label, hint, help, className, controlClassName, blank = "keep", onChange, ...area }: FieldFrame & { blank?: Blank } & Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, "name" | "className">) {
  const id = useId();
  const frame = { name, label, hint, help, className };
  const { ctx, error } = useField(name);
  return (
    <Frame id={id} frame={frame} error={error}>
      <TextArea id={id} className={controlClassName} {...area} {...ctx.register(name, { setValueAs: blankAs(blank), onChange })} aria-invalid={error ? true : undefined} aria-describedby={described(id, frame, error)} />
    </Frame>
  );
}

export function SelectInput({
  name,
  label,
  hint,
  help,
  className,
  controlClassName,
  options,
  blank = "keep",
  onChange,
  ...select
}: FieldFrame & { options: Array<{ value: string; label: ReactNode }>; blank?: Blank } & Omit<SelectHTMLAttributes<HTMLSelectElement>, "name" | "className">) {
  const id = useId();
  const frame = { name, label, hint, help, className };
  const { ctx, error } = useField(name);
  return (
    <Frame id={id} frame={frame} error={error}>
      <Select id={id} className={controlClassName} {...select} {...ctx.register(name, { setValueAs: blankAs(blank), onChange })} aria-invalid={error ? true : undefined} aria-describedby={described(id, frame, error)}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </Select>
    </Frame>
  );
}

export function CheckboxField({ name, label, disabled, onChange }: { name: string; label: ReactNode; disabled?: boolean; onChange?: RegisterOptions["onChange"] }) {
  const id = useId();
  const { ctx } = useField(name);
  return (
    <div className="flex items-center gap-2 text-sm">
      <input id={id} type="checkbox" disabled={disabled} {...ctx.register(name, { onChange })} className="size-4 accent-[var(--color-brass)]" />
      <label htmlFor={id} className="text-ink">
        {label}
      </label>
    </div>
  );
}

/** Several checkboxes of one field holding a list (a token's scopes). */
export function CheckboxGroup({ name, legend, options, className }: { name: string; legend: ReactNode; options: Array<{ value: string; label: ReactNode }>; className?: string }) {
  const id = useId();
  const { ctx, error } = useField(name);
  return (
    <fieldset className={className} aria-describedby={error?.message ? `${id}-error` : undefined}>
      <legend className="mb-1 text-xs font-medium text-muted">{legend}</legend>
      <div className="space-y-1">
        {options.map((o) => (
          <label key={o.value} className="flex items-start gap-2 text-sm">
            <input type="checkbox" value={o.value} {...ctx.register(name)} className="mt-1 size-4 accent-[var(--color-brass)]" />
            <span>{o.label}</span>
          </label>
        ))}
      </div>
      {error?.message && (
        <p id={`${id}-error`} className="mt-1 text-xs text-down" data-testid={`error-${name}`}>
          {error.message}
        </p>
      )}
    </fieldset>
  );
}
