"use client";

import { useMutation } from "@tanstack/react-query";
import Link from "next/link";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { resetConfirmInput } from "@/lib/validation/mail";

export function ConfirmForm({ token, email }: { token: string; email: string }) {
  const [password, setPassword] = useState("");
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (input: z.infer<typeof resetConfirmInput>) => fetchJson("/api/password-reset/confirm", { method: "POST", body: JSON.stringify(input) }),
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = resetConfirmInput.safeParse({ token, password });
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    setFieldErrors({});
    save.mutate(parsed.data);
  }

  if (save.isSuccess) {
    return (
      <div className="mt-6 flex flex-col gap-4">
        <Notice tone="ok" title="Your password is changed." />
        <Link href="/sign-in" className="text-sm text-accent underline">
          Sign in
        </Link>
      </div>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="mt-6 flex flex-col gap-4">
      <p className="text-sm text-ink-soft">
        For <strong className="text-ink">{email}</strong>.
      </p>
      {save.isError ? <Notice tone="fail" title={save.error.message} /> : null}
      <Field label="New password" name="password" errors={fieldErrors.password} hint="At least 12 characters; a few unrelated words make a strong one.">
        <TextInput id="password" name="password" type="password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} invalid={!!fieldErrors.password} />
      </Field>
      <Button type="submit" disabled={save.isPending}>
        {save.isPending ? "Saving…" : "Save the new password"}
      </Button>
    </form>
  );
}
