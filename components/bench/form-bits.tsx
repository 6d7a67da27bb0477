"use client";
import type { SelectHTMLAttributes, TextareaHTMLAttributes } from "react";
import { ApiError } from "@/lib/queries/client";

export function Select({ invalid, className = "", ...props }: SelectHTMLAttributes<HTMLSelectElement> & { invalid?: boolean }) {
  return <select aria-invalid={invalid || undefined} className={`rounded-md border bg-sheet px-3 py-2 text-sm text-ink ${invalid ? "border-fail" : "border-rule"} ${className}`} {...props} />;
}

export function TextArea({ className = "", ...props }: TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <textarea rows={2} className={`rounded-md border border-rule bg-sheet px-3 py-2 text-sm ${className}`} {...props} />;
}

/** Field errors from a failed mutation, keyed by field name. */
export function fieldErrorsOf(e: unknown): Record<string, string[]> {
  return e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {};
}

export function formValues(form: HTMLFormElement): Record<string, string> {
  const out: Record<string, string> = {};
  new FormData(form).forEach((v, k) => {
    if (typeof v === "string") out[k] = v;
  });
  return out;
}

/** Drops empty optional fields so the server applies its defaults. */
export function withoutEmpty(v: Record<string, string>, keys: string[]): Record<string, string> {
  const out = { ...v };
  for (const k of keys) if (out[k] === "") delete out[k];
  return out;
}
