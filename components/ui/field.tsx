import type { InputHTMLAttributes, ReactNode } from "react";

export function Field({
  label,
  name,
  errors,
  hint,
  children,
}: {
  label: string;
  name: string;
  errors?: string[];
  hint?: ReactNode;
  children?: ReactNode;
}) {
  const errId = `${name}-error`;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={name} className="text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint && !errors?.length ? <p className="text-xs text-ink-soft">{hint}</p> : null}
      {errors?.length ? (
        <p id={errId} role="alert" className="text-xs text-fail">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

export function TextInput({ invalid, className = "", ...props }: InputHTMLAttributes<HTMLInputElement> & { invalid?: boolean }) {
  return (
    <input
      aria-invalid={invalid || undefined}
      aria-describedby={invalid && props.name ? `${props.name}-error` : undefined}
      className={`rounded-md border bg-sheet px-3 py-2 text-sm text-ink placeholder:text-ink-soft/60 ${invalid ? "border-fail" : "border-rule"} ${className}`}
      {...props}
    />
  );
}
