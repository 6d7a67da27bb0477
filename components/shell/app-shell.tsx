import Link from "next/link";
import type { ReactNode } from "react";
import { navByRole, roleHome, roleLabel } from "@/lib/permissions";
import type { SessionUser } from "@/lib/server/session";
import { NavLinks } from "./nav-links";
import { SignOutButton } from "./sign-out-button";

export function AppShell({ user, children }: { user: SessionUser; children: ReactNode }) {
  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:rounded focus:bg-sheet focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="border-b border-rule bg-sheet/80">
        <nav className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3" aria-label="Platewright">
          <Link href={roleHome[user.role]} className="flex items-center gap-2 font-semibold tracking-tight">
            <Logo />
            Platewright
          </Link>
          <NavLinks items={navByRole[user.role]} />
          <div className="ml-auto flex items-center gap-4 text-sm">
            <span className="text-ink-soft" data-testid="whoami">
              {user.name} · <span className="font-medium text-ink">{roleLabel[user.role]}</span>
            </span>
            <SignOutButton />
          </div>
        </nav>
      </header>
      <main id="main" className="mx-auto max-w-6xl px-4 py-8">
        {children}
      </main>
    </div>
  );
}

function Logo() {
  // A plate seen from above with three parts on it: our own mark.
  return (
    <svg width="22" height="22" viewBox="0 0 22 22" aria-hidden>
      <rect x="1.5" y="1.5" width="19" height="19" rx="3" fill="none" stroke="currentColor" strokeWidth="1.5" />
      <rect x="5" y="5" width="5" height="5" rx="1" fill="var(--color-accent)" />
      <rect x="12" y="5" width="5" height="8" rx="1" fill="var(--color-clay)" />
      <circle cx="8" cy="15" r="2.5" fill="var(--color-ink)" />
    </svg>
  );
}
