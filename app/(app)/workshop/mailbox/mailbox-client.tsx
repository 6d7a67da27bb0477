"use client";

import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useTransition } from "react";
import { Button } from "@/components/ui/button";
import { fetchJson } from "@/lib/queries/client";

export function MailboxActions() {
  const router = useRouter();
  const [pending, start] = useTransition();
  return (
    <Button variant="secondary" disabled={pending} onClick={() => start(() => router.refresh())}>
      {pending ? "Refreshing…" : "Refresh"}
    </Button>
  );
}

export function RetryButton({ id }: { id: number }) {
  const router = useRouter();
  const retry = useMutation({
    mutationFn: () => fetchJson(`/api/mail/outbox/${id}/retry`, { method: "POST" }),
    onSuccess: () => router.refresh(),
  });
  return (
    <Button variant="secondary" disabled={retry.isPending} onClick={() => retry.mutate()} title={retry.isError ? retry.error.message : undefined}>
      {retry.isPending ? "…" : retry.isError ? "Retry failed" : "Retry"}
    </Button>
  );
}
