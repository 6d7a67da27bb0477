import type { Metadata } from "next";
import { FloorBoard } from "@/components/floor/floor-board";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { UNATTENDED_CAUTION } from "@/lib/plan/plan";
import type { FloorBoardWire } from "@/lib/queries/queue";
import { floorBoard } from "@/lib/server/queue";
import { requirePageUser } from "@/lib/server/session";
import { getWorkshopSettings } from "@/lib/server/workshop";

export const metadata: Metadata = { title: "Floor" };

export default async function FloorPage() {
  const user = await requirePageUser("floor:view", "/floor");
  const [settings, board] = await Promise.all([getWorkshopSettings(), floorBoard(user)]);
  const caution = `${UNATTENDED_CAUTION}${settings.safetyNote ? ` Workshop rules: ${settings.safetyNote}` : ""}`;
  return (
    <>
      <PageHeader title="Floor" lead="The printers and the plates lined up for each, the copies waiting, and the actions of the day." />
      <div className="flex flex-col gap-6">
        <Notice tone="warn" title="Hot surfaces, moving parts, fumes">
          {settings.safetyNote || "Follow the workshop's house rules and local codes."}
        </Notice>
        <FloorBoard initial={JSON.parse(JSON.stringify(board)) as FloorBoardWire} caution={caution} />
      </div>
    </>
  );
}
