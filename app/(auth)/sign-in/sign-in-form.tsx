"use client";

import { signIn } from "next-auth/react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";

const schema = z.object({
  email: z.string().trim().email("Enter an e-mail address such as name@example.org."),
  password: z.string().min(1, "Enter your password."),
});

export function SignInForm({ next }: { next: string }) {
  const router = useRouter();
  const [email, setEmail] = useState("");
  const [password, setPassword] = useState("");
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    setError(null);
    const parsed = schema.safeParse({ email, password });
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    setFieldErrors({});
    setBusy(true);
    try {
      const res = await signIn("credentials", { ...parsed.data, redirect: false });
      if (!res || res.error) {
        setError(res?.error && res.error !== "CredentialsSignin" ? res.error : "That e-mail address and password do not match an account.");
        return;
      }
      router.replace(next);
      router.refresh();
    } catch {
      setError("The server could not be reached. Try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="mt-6 flex flex-col gap-4">
      {error ? <Notice tone="fail" title={error} /> : null}
      <Field label="E-mail" name="email" errors={fieldErrors.email}>
        <TextInput id="email" name="email" type="email" autoComplete="username" value={email} onChange={(e) => setEmail(e.target.value)} invalid={!!fieldErrors.email} />
      </Field>
      <Field label="Password" name="password" errors={fieldErrors.password}>
        <TextInput id="password" name="password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} invalid={!!fieldErrors.password} />
      </Field>
      <Button type="submit" disabled={busy}>
        {busy ? "Signing in…" : "Sign in"}
      </Button>
      <Link href="/reset" className="text-center text-sm text-ink-soft underline-offset-4 hover:text-ink hover:underline">
        Forgot your password?
      </Link>
    </form>
  );
}
