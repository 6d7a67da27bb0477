import type { Metadata } from "next";
import { AssemblyList } from "@/components/bench/assembly-list";
import { PageHeader } from "@/components/ui/page-header";
import { listMyAssemblies } from "@/lib/server/assemblies";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Bench" };

export default async function BenchPage() {
  const user = await requirePageUser("bench:use", "/bench");
  const assemblies = await listMyAssemblies(user);
  return (
    <>
      <PageHeader title="Bench" lead={`Your assemblies and parts, ${user.name.split(" ")[0]}. Plan how each part prints, then send it to the workshop.`} />
      <AssemblyList initial={assemblies} />
    </>
  );
}
