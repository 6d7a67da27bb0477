"use client";

import { useMutation } from "@tanstack/react-query";
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { acceptInviteInput } from "@/lib/validation/mail";

export function AcceptForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [name, setName] = useState("");
  const [password, setPassword] = useState("");
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const [signInError, setSignInError] = useState<string | null>(null);
  const accept = useMutation({
    mutationFn: (input: z.infer<typeof acceptInviteInput>) => fetchJson<{ email: string }>("/api/invitations/accept", { method: "POST", body: JSON.stringify(input) }),
    onSuccess: async () => {
      const res = await signIn("credentials", { email, password, redirect: false });
      if (!res || res.error) {
        setSignInError("Your account is ready, but signing in failed. Sign in with your new password.");
        return;
      }
      router.replace("/bench");
      router.refresh();
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = acceptInviteInput.safeParse({ token, name, password });
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    setFieldErrors({});
    accept.mutate(parsed.data);
  }

  return (
    <form onSubmit={onSubmit} noValidate className="mt-6 flex flex-col gap-4">
      {accept.isError ? <Notice tone="fail" title={accept.error.message} /> : null}
      {signInError ? <Notice tone="warn" title={signInError} /> : null}
      <Field label="Your name" name="name" errors={fieldErrors.name}>
        <TextInput id="name" name="name" autoComplete="name" value={name} onChange={(e) => setName(e.target.value)} invalid={!!fieldErrors.name} />
      </Field>
      <Field label="Password" name="password" errors={fieldErrors.password} hint="At least 12 characters; a few unrelated words make a strong one.">
        <TextInput id="password" name="password" type="password" autoComplete="new-password" value={password} onChange={(e) => setPassword(e.target.value)} invalid={!!fieldErrors.password} />
      </Field>
      <Button type="submit" disabled={accept.isPending || accept.isSuccess}>
        {accept.isPending ? "Creating your account…" : accept.isSuccess ? "Signing you in…" : "Join and sign in"}
      </Button>
    </form>
  );
}
