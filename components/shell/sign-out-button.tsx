"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button type="button" onClick={() => signOut({ callbackUrl: "/sign-in" })} className="text-sm text-ink-soft underline-offset-4 hover:text-ink hover:underline">
      Sign out
    </button>
  );
}
