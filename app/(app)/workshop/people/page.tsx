import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/ui/page-header";
import { listInvitations, listPeople } from "@/lib/server/invitations";
import { mailboxEnabled } from "@/lib/server/mail/mailbox";
import { requirePageUser } from "@/lib/server/session";
import { PeopleClient, type InvitationView, type PersonView } from "./people-client";

export const metadata: Metadata = { title: "People" };

export default async function PeoplePage() {
  const user = await requirePageUser("people:manage", "/workshop/people");
  const [people, invitations] = await Promise.all([listPeople(user), listInvitations(user)]);
  const initialPeople: PersonView[] = people.map((p) => ({ ...p, createdAt: p.createdAt.toISOString() }));
  const initialInvitations: InvitationView[] = invitations.map((i) => ({
    id: i.id,
    email: i.email,
    invitedByName: i.invitedByName,
    expiresAt: i.expiresAt.toISOString(),
    state: i.state,
  }));
  return (
    <>
      <PageHeader
        title="People"
        lead="Everyone with an account, their role, and invitations. Invited people join as members; change a role here afterwards."
        actions={
          mailboxEnabled() ? (
            <Link href="/workshop/mailbox" className="text-sm text-accent underline">
              Test mailbox
            </Link>
          ) : null
        }
      />
      <PeopleClient selfId={user.id} initialPeople={initialPeople} initialInvitations={initialInvitations} />
    </>
  );
}
