import type { Metadata } from "next";
import Link from "next/link";
import { Notice } from "@/components/ui/notice";
import { resetState } from "@/lib/server/password-reset";
import { ConfirmForm } from "./confirm-form";

export const metadata: Metadata = { title: "Choose a new password" };
export const dynamic = "force-dynamic";

const why = {
  used: "This reset link was already used.",
  expired: "This reset link has expired (links last one hour).",
  unknown: "This reset link is not valid. Copy the whole link from the message.",
} as const;

export default async function ResetConfirmPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const state = /^[A-Za-z0-9_-]{43}$/.test(token) ? await resetState(token) : ({ state: "unknown" } as const);
  return (
    <main className="flex min-h-screen items-center justify-center px-4">
      <div className="w-full max-w-sm rounded-xl border border-rule bg-sheet p-8 shadow-sm">
        <p className="text-sm font-semibold tracking-tight text-accent">Platewright</p>
        <h1 className="mt-1">Choose a new password</h1>
        {state.state === "valid" ? (
          <ConfirmForm token={token} email={state.email} />
        ) : (
          <div className="mt-6 flex flex-col gap-4">
            <Notice tone="fail" title="This link cannot be used.">
              {why[state.state]}
            </Notice>
            <Link href="/reset" className="text-sm text-accent underline">
              Ask for a new link
            </Link>
          </div>
        )}
      </div>
    </main>
  );
}
