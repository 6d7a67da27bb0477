import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { getMyPreferences } from "@/lib/server/mail/preferences";
import { requirePageUser } from "@/lib/server/session";
import { PreferencesForm } from "./preferences-form";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const user = await requirePageUser("account:messages", "/account");
  const prefs = await getMyPreferences(user);
  return (
    <>
      <PageHeader title="Account" lead={`Signed in as ${user.email}. Choose which messages you get by e-mail.`} />
      <PreferencesForm initial={prefs} staff={user.role !== "member"} />
    </>
  );
}
