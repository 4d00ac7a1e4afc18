// Filter-bar controls with their label built in: each control has a visible label tied to it,
// so it has an accessible name without the caller wiring ids.
import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";

const CONTROL = "rounded-md border border-line bg-raised px-2 py-1.5 text-sm text-ink placeholder:text-faint focus:border-brass focus:outline-none focus-visible:ring-2 focus-visible:ring-brass/50";

export function TextField({ label, className = "", ...props }: InputHTMLAttributes<HTMLInputElement> & { label: string }) {
  const id = useId();
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-xs font-medium text-muted">
        {label}
      </label>
      <input id={id} {...props} className={CONTROL} />
    </div>
  );
}

export function SelectField({
  label,
  options,
  className = "",
  ...props
}: SelectHTMLAttributes<HTMLSelectElement> & { label: string; options: Array<{ value: string; label: ReactNode }> }) {
  const id = useId();
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-xs font-medium text-muted">
        {label}
      </label>
      <select id={id} {...props} className={CONTROL}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

export function CheckField({ label, ...props }: InputHTMLAttributes<HTMLInputElement> & { label: ReactNode }) {
  const id = useId();
  return (
    <div className="flex items-center gap-2 text-sm">
      <input id={id} type="checkbox" {...props} className="size-4 accent-[var(--color-brass)]" />
      <label htmlFor={id} className="text-ink">
        {label}
      </label>
    </div>
  );
}
