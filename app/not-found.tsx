import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl px-4 py-16">
      <p className="text-sm font-semibold text-ink-soft">404</p>
      <h1 className="mt-2">Nothing here</h1>
      <p className="mt-2 text-sm text-ink-soft">The page does not exist, or it is not shared with you.</p>
      <Link href="/" className="mt-6 inline-block text-sm text-accent underline underline-offset-4">
        Back to your home page
      </Link>
    </main>
  );
}
