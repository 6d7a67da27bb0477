"use client";

import { useMutation } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { resetRequestInput } from "@/lib/validation/mail";

export function RequestForm() {
  const [email, setEmail] = useState("");
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const send = useMutation({
    mutationFn: (input: { email: string }) => fetchJson("/api/password-reset", { method: "POST", body: JSON.stringify(input) }),
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = resetRequestInput.safeParse({ email });
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    setFieldErrors({});
    send.mutate(parsed.data);
  }

  if (send.isSuccess) {
    return (
      <div className="mt-6">
        <Notice tone="ok" title="Check your e-mail.">
          If {email} has an account here, a reset link is on its way.
        </Notice>
      </div>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="mt-6 flex flex-col gap-4">
      {send.isError ? <Notice tone="fail" title={send.error.message} /> : null}
      <Field label="E-mail" name="email" errors={fieldErrors.email}>
        <TextInput id="email" name="email" type="email" autoComplete="username" value={email} onChange={(e) => setEmail(e.target.value)} invalid={!!fieldErrors.email} />
      </Field>
      <Button type="submit" disabled={send.isPending}>
        {send.isPending ? "Sending…" : "Send the link"}
      </Button>
    </form>
  );
}
