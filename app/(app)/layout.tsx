import type { ReactNode } from "react";
import { AppShell } from "@/components/shell/app-shell";
import { requireShellUser } from "@/lib/server/page-gate";

// The shell needs a signed-in user; it also runs the page's role and object checks before anything
// is streamed, so a refused page answers 403/404 (each page still checks its own role).
export default async function AppLayout({ children }: { children: ReactNode }) {
  const user = await requireShellUser();
  return <AppShell user={user}>{children}</AppShell>;
}
