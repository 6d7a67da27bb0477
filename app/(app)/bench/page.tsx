import type { Metadata } from "next";
import { EmptyState } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Bench" };

export default async function BenchPage() {
  const user = await requirePageUser("bench:use", "/bench");
  return (
    <>
      <PageHeader title="Bench" lead={`Your assemblies and parts, ${user.name.split(" ")[0]}. Plan how each part prints, then send it to the workshop.`} />
      <section aria-labelledby="assemblies-h" className="flex flex-col gap-3">
        <h2 id="assemblies-h">My assemblies</h2>
        <EmptyState title="No assemblies yet">Assemblies, their parts and hardware will appear here.</EmptyState>
      </section>
    </>
  );
}
