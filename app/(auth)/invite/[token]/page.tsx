import type { Metadata } from "next";
import Link from "next/link";
import { Notice } from "@/components/ui/notice";
import { invitationState } from "@/lib/server/invitations";
import { AcceptForm } from "./accept-form";

export const metadata: Metadata = { title: "Join the workshop" };
export const dynamic = "force-dynamic";

const why = {
  used: "This invitation link was already used. If that was you, sign in; otherwise ask an admin for a new invitation.",
  expired: "This invitation link has expired. Ask an admin for a new one.",
  unknown: "This invitation link is not valid. Copy the whole link from the message, or ask an admin for a new one.",
} as const;

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const state = /^[A-Za-z0-9_-]{43}$/.test(token) ? await invitationState(token) : ({ state: "unknown" } as const);
  return (
    <main className="flex min-h-screen items-center justify-center px-4">
      <div className="w-full max-w-sm rounded-xl border border-rule bg-sheet p-8 shadow-sm">
        <p className="text-sm font-semibold tracking-tight text-accent">Platewright</p>
        <h1 className="mt-1">Join the workshop</h1>
        {state.state === "valid" ? (
          <>
            <p className="mt-2 text-sm text-ink-soft">
              Choose your name and a password for <strong className="text-ink">{state.email}</strong>.
            </p>
            <AcceptForm token={token} email={state.email} />
          </>
        ) : (
          <div className="mt-6 flex flex-col gap-4">
            <Notice tone="fail" title="This link cannot be used.">
              {why[state.state]}
            </Notice>
            <Link href="/sign-in" className="text-sm text-accent underline">
              Go to sign-in
            </Link>
          </div>
        )}
      </div>
    </main>
  );
}
