import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { roleHome } from "@/lib/permissions";
import { sameOriginPath } from "@/lib/safe-redirect";
import { appOrigin } from "@/lib/server/origin";
import { currentUser } from "@/lib/server/session";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string }> }) {
  const user = await currentUser();
  const { callbackUrl } = await searchParams;
  if (user) redirect(roleHome[user.role]);
  // Only places on our own origin are followed after sign-in (parsed as a browser would).
  const next = sameOriginPath(callbackUrl, appOrigin());
  return (
    <main className="flex min-h-screen items-center justify-center px-4">
      <div className="w-full max-w-sm rounded-xl border border-rule bg-sheet p-8 shadow-sm">
        <p className="text-sm font-semibold tracking-tight text-accent">Platewright</p>
        <h1 className="mt-1">Sign in to your workshop</h1>
        <p className="mt-2 text-sm text-ink-soft">Plan parts, follow plates, run the printers.</p>
        <SignInForm next={next} />
      </div>
    </main>
  );
}
