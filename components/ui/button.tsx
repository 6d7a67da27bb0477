import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "danger" | "ghost";

const styles: Record<Variant, string> = {
  primary: "bg-accent text-white hover:bg-accent-ink border-accent",
  secondary: "bg-sheet text-ink hover:bg-paper border-rule",
  danger: "bg-fail text-white hover:opacity-90 border-fail",
  ghost: "bg-transparent text-ink-soft hover:text-ink border-transparent",
};

export function Button({ variant = "primary", className = "", ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return (
    <button
      className={`inline-flex items-center justify-center gap-2 rounded-md border px-3.5 py-2 text-sm font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-50 ${styles[variant]} ${className}`}
      {...props}
    />
  );
}
