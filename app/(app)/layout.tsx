import type { ReactNode } from "react";
import { AppShell } from "@/components/shell/app-shell";
import { requirePageUser } from "@/lib/server/session";

// The shell only needs a signed-in user; each page checks its own role.
export default async function AppLayout({ children }: { children: ReactNode }) {
  const user = await requirePageUser();
  return <AppShell user={user}>{children}</AppShell>;
}
