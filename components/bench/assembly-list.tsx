"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { EmptyState, Notice } from "@/components/ui/notice";
import type { AssemblySummary } from "@/lib/server/assemblies";
import { assembliesQuery, sendJson } from "@/lib/queries/assemblies";
import { queryKeys } from "@/lib/queries/keys";
import { fieldErrorsOf, formValues, TextArea } from "./form-bits";
import { ProgressBar } from "./progress-bar";

const accessLabel = { owner: "Yours", edit: "Shared with you to edit", read: "Shared with you to read", workshop: "Workshop view" } as const;

export function AssemblyList({ initial }: { initial: AssemblySummary[] }) {
  const q = useQuery({ ...assembliesQuery(), initialData: initial });
  const qc = useQueryClient();
  const router = useRouter();
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const create = useMutation({
    mutationFn: (v: Record<string, string>) => sendJson<{ id: number }>("/api/assemblies", "POST", v),
    onSuccess: async ({ id }) => {
      setErrors({});
      await qc.invalidateQueries({ queryKey: queryKeys.assemblies.all });
      router.push(`/bench/assemblies/${id}`);
    },
    onError: (e) => setErrors(fieldErrorsOf(e)),
  });

  function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    create.mutate(formValues(e.currentTarget));
  }

  return (
    <div className="grid gap-8 lg:grid-cols-[1fr_20rem]">
      <section aria-labelledby="assemblies-h" className="flex flex-col gap-3">
        <h2 id="assemblies-h">My assemblies</h2>
        {q.isError ? <Notice tone="fail" title="Your assemblies could not be loaded.">{q.error.message}</Notice> : null}
        {q.data.length === 0 ? (
          <EmptyState title="No assemblies yet">Create your first assembly with the form; add its parts and hardware next.</EmptyState>
        ) : (
          <ul className="flex flex-col divide-y divide-rule rounded-lg border border-rule bg-sheet">
            {q.data.map((a) => (
              <li key={a.id} className="flex flex-col gap-2 px-4 py-3">
                <div className="flex flex-wrap items-baseline justify-between gap-2">
                  <Link href={`/bench/assemblies/${a.id}`} className="font-medium text-accent-ink hover:underline">
                    {a.name}
                  </Link>
                  <span className="text-xs text-ink-soft">
                    {accessLabel[a.access]}
                    {a.access !== "owner" ? ` · ${a.ownerName}` : ""}
                    {a.targetDate ? ` · due ${a.targetDate}` : ""}
                  </span>
                </div>
                {a.description ? <p className="text-sm text-ink-soft">{a.description}</p> : null}
                <ProgressBar value={a.done} max={a.needed} label={`${a.name}: parts accepted`} />
              </li>
            ))}
          </ul>
        )}
      </section>
      <section aria-labelledby="new-h" className="flex flex-col gap-3">
        <h2 id="new-h">New assembly</h2>
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4 rounded-lg border border-rule bg-sheet p-4">
          {create.isError && !Object.keys(errors).length ? <Notice tone="fail" title={create.error.message} /> : null}
          <Field label="Name" name="name" errors={errors.name}>
            <TextInput id="name" name="name" required invalid={!!errors.name} />
          </Field>
          <Field label="Description" name="description" errors={errors.description}>
            <TextArea id="description" name="description" />
          </Field>
          <Field label="Target date" name="targetDate" errors={errors.targetDate} hint="Optional: when you want it finished.">
            <TextInput id="targetDate" name="targetDate" type="date" invalid={!!errors.targetDate} />
          </Field>
          <Button type="submit" disabled={create.isPending}>
            {create.isPending ? "Creating…" : "Create assembly"}
          </Button>
        </form>
      </section>
    </div>
  );
}
