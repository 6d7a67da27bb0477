import type { Metadata } from "next";
import { MyPartsTable } from "@/components/bench/my-parts-table";
import { PageHeader } from "@/components/ui/page-header";
import type { MyPartWire } from "@/lib/queries/parts";
import { listMyParts } from "@/lib/server/parts";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "My parts" };

export default async function MyPartsPage() {
  const user = await requirePageUser("bench:use", "/bench/parts");
  const rows = await listMyParts(user);
  return (
    <>
      <PageHeader title="My parts" lead="Every printed part across your assemblies and those shared with you. Counts are copies: a part needed four times moves as four." />
      <MyPartsTable initial={JSON.parse(JSON.stringify(rows)) as MyPartWire[]} />
    </>
  );
}
