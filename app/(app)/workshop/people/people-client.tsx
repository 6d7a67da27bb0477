"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { EmptyState, Notice } from "@/components/ui/notice";
import type { Role } from "@/db/schema/users";
import { roleLabel } from "@/lib/permissions";
import { ApiError, fetchJson } from "@/lib/queries/client";
import { queryKeys } from "@/lib/queries/keys";
import { inviteInput } from "@/lib/validation/mail";

export interface PersonView {
  id: number;
  name: string;
  email: string;
  role: Role;
  active: boolean;
  createdAt: string;
}

export interface InvitationView {
  id: number;
  email: string;
  invitedByName: string | null;
  expiresAt: string;
  state: "open" | "joined" | "expired";
}


export function PeopleClient({ selfId, initialPeople, initialInvitations }: { selfId: number; initialPeople: PersonView[]; initialInvitations: InvitationView[] }) {
  const qc = useQueryClient();
  const people = useQuery({ queryKey: queryKeys.people.list(), queryFn: () => fetchJson<PersonView[]>("/api/people"), initialData: initialPeople });
  const invitations = useQuery({
    queryKey: queryKeys.people.invitations(),
    queryFn: () => fetchJson<InvitationView[]>("/api/invitations"),
    initialData: initialInvitations,
  });
  const [email, setEmail] = useState("");
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const invite = useMutation({
    mutationFn: (input: { email: string }) => fetchJson<{ email: string }>("/api/invitations", { method: "POST", body: JSON.stringify(input) }),
    onSuccess: () => {
      setEmail("");
      setFieldErrors({});
      void qc.invalidateQueries({ queryKey: queryKeys.people.all });
    },
    onError: (e) => setFieldErrors(e instanceof ApiError && e.fieldErrors ? e.fieldErrors : {}),
  });
  const update = useMutation({
    mutationFn: ({ id, ...body }: { id: number; role?: Role; active?: boolean }) => fetchJson<PersonView>(`/api/people/${id}`, { method: "PATCH", body: JSON.stringify(body) }),
    onSettled: () => void qc.invalidateQueries({ queryKey: queryKeys.people.all }),
  });

  function onInvite(e: FormEvent) {
    e.preventDefault();
    const parsed = inviteInput.safeParse({ email });
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    invite.mutate(parsed.data);
  }

  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="invite-h" className="max-w-xl">
        <h2 id="invite-h" className="mb-3 text-base font-semibold">Invite someone</h2>
        <form onSubmit={onInvite} noValidate className="flex flex-wrap items-end gap-3">
          <div className="min-w-64 flex-1">
            <Field label="E-mail address to invite" name="email" errors={fieldErrors.email}>
              <TextInput id="email" name="email" type="email" value={email} onChange={(e) => setEmail(e.target.value)} invalid={!!fieldErrors.email} />
            </Field>
          </div>
          <Button type="submit" disabled={invite.isPending}>
            {invite.isPending ? "Sending…" : "Send invitation"}
          </Button>
        </form>
        <div className="mt-3">
          {invite.isSuccess ? <Notice tone="ok" title={`Invitation queued for ${invite.data.email}.`} /> : null}
          {invite.isError && !Object.keys(fieldErrors).length ? <Notice tone="fail" title={invite.error.message} /> : null}
        </div>
      </section>

      <section aria-labelledby="people-h">
        <h2 id="people-h" className="mb-3 text-base font-semibold">Accounts</h2>
        {update.isError ? <Notice tone="fail" title={update.error.message} /> : null}
        <table className="w-full text-sm">
          <thead className="border-b border-rule text-left text-ink-soft">
            <tr>
              <th className="py-2 font-medium">Name</th>
              <th className="py-2 font-medium">E-mail</th>
              <th className="py-2 font-medium">Role</th>
              <th className="py-2 font-medium">State</th>
              <th className="py-2" />
            </tr>
          </thead>
          <tbody>
            {people.data.map((p) => {
              const self = p.id === selfId;
              return (
                <tr key={p.id} className="border-b border-rule/60" data-testid={`person-${p.email}`}>
                  <td className="py-2">{p.name}{self ? <span className="ml-2 text-xs text-ink-soft">(you)</span> : null}</td>
                  <td className="py-2">{p.email}</td>
                  <td className="py-2">
                    <select
                      aria-label={`Role of ${p.name}`}
                      value={p.role}
                      disabled={self || update.isPending}
                      onChange={(e) => update.mutate({ id: p.id, role: e.target.value as Role })}
                      className="rounded-md border border-rule bg-sheet px-2 py-1"
                    >
                      {(["member", "operator", "admin"] as const).map((r) => (
                        <option key={r} value={r}>{roleLabel[r]}</option>
                      ))}
                    </select>
                  </td>
                  <td className="py-2">{p.active ? "Active" : "Deactivated"}</td>
                  <td className="py-2 text-right">
                    {self ? null : (
                      <Button variant={p.active ? "ghost" : "secondary"} disabled={update.isPending} onClick={() => update.mutate({ id: p.id, active: !p.active })}>
                        {p.active ? "Deactivate" : "Reactivate"}
                      </Button>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </section>

      <section aria-labelledby="inv-h">
        <h2 id="inv-h" className="mb-3 text-base font-semibold">Invitations</h2>
        {invitations.data.length === 0 ? (
          <EmptyState title="No invitations yet.">Invite someone above; they get a link by e-mail.</EmptyState>
        ) : (
          <ul className="divide-y divide-rule/60 text-sm">
            {invitations.data.map((i) => (
              <li key={i.id} className="flex flex-wrap justify-between gap-2 py-2">
                <span>{i.email}</span>
                <span className="text-ink-soft">
                  {i.state === "joined" ? "✓ joined" : i.state === "expired" ? "expired" : `open until ${new Date(i.expiresAt).toLocaleString()}`}
                  {i.invitedByName ? ` · by ${i.invitedByName}` : ""}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
