import type { Metadata } from "next";
import Link from "next/link";
import { RequestForm } from "./request-form";

export const metadata: Metadata = { title: "Reset your password" };

export default function ResetRequestPage() {
  return (
    <main className="flex min-h-screen items-center justify-center px-4">
      <div className="w-full max-w-sm rounded-xl border border-rule bg-sheet p-8 shadow-sm">
        <p className="text-sm font-semibold tracking-tight text-accent">Platewright</p>
        <h1 className="mt-1">Reset your password</h1>
        <p className="mt-2 text-sm text-ink-soft">We send a link to your e-mail address. It works once, for one hour.</p>
        <RequestForm />
        <Link href="/sign-in" className="mt-4 inline-block text-sm text-accent underline">
          Back to sign-in
        </Link>
      </div>
    </main>
  );
}
