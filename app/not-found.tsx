import { headers } from "next/headers";
import Link from "next/link";
import { PATH_HEADER } from "@/lib/page-gates";

// Also shown, with status 404, when the shell refuses a member's object before streaming
// (lib/server/page-gate.ts): the wording then names what was asked for, as the page's own would.
const byPath: { pattern: RegExp; title: string; back: { href: string; label: string } }[] = [
  { pattern: /^\/bench\/assemblies\//, title: "No such assembly, or it is not shared with you", back: { href: "/bench", label: "Back to the Bench" } },
  { pattern: /^\/bench\/parts\//, title: "No such part, or it is not shared with you", back: { href: "/bench/parts", label: "Back to My parts" } },
];

export default async function NotFound() {
  const path = (await headers()).get(PATH_HEADER) ?? "";
  const known = byPath.find((p) => p.pattern.test(path));
  return (
    <main className="mx-auto max-w-xl px-4 py-16">
      <p className="text-sm font-semibold text-ink-soft">404</p>
      <h1 className="mt-2">{known ? known.title : "Nothing here"}</h1>
      {known ? null : <p className="mt-2 text-sm text-ink-soft">The page does not exist, or it is not shared with you.</p>}
      <Link href={known?.back.href ?? "/"} className="mt-6 inline-block text-sm text-accent underline underline-offset-4">
        {known?.back.label ?? "Back to your home page"}
      </Link>
    </main>
  );
}
