import Link from "next/link";

export default function Forbidden() {
  return (
    <main className="mx-auto max-w-xl px-4 py-16">
      <p className="text-sm font-semibold text-fail">403 · Not for your role</p>
      <h1 className="mt-2">This page belongs to another role</h1>
      <p className="mt-2 text-sm text-ink-soft">Your account can&apos;t open it. If you think it should, ask the workshop&apos;s admin.</p>
      <Link href="/" className="mt-6 inline-block text-sm text-accent underline underline-offset-4">
        Back to your home page
      </Link>
    </main>
  );
}
