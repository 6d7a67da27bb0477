// GET /api/ledger/export?kind=charges|payments: every charge or payment as a CSV download (admins).
import { errorResponse } from "@/lib/server/errors";
import { exportCsv } from "@/lib/server/ledger";
import { requireUser } from "@/lib/server/session";
import { exportQuery } from "@/lib/validation/ledger";

export async function GET(req: Request) {
  try {
    const user = await requireUser("ledger:admin");
    const { kind } = exportQuery.parse(Object.fromEntries(new URL(req.url).searchParams));
    const csv = await exportCsv(user, kind);
    const day = new Date().toISOString().slice(0, 10);
    return new Response(csv, {
      headers: {
        "content-type": "text/csv; charset=utf-8; header=present",
        "content-disposition": `attachment; filename="platewright-${kind}-${day}.csv"`,
        "cache-control": "no-store",
      },
    });
  } catch (e) {
    return errorResponse(e);
  }
}
