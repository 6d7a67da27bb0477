// GET /api/queue/board: the Floor's lanes, plates, attended spells and waiting list (operators, admins), with an ETag for cheap polling.
import { createHash } from "node:crypto";
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { floorBoard } from "@/lib/server/queue";
import { requireUser } from "@/lib/server/session";

export async function GET(req: Request) {
  try {
    const user = await requireUser("queue:manage");
    const { now, window, open, ...data } = await floorBoard(user);
    // The clock moves every poll; the tag hashes what changes with the data, not the time. The body
    // is that same serialisation with the clock fields put in front, so the board is stringified once.
    const dataJson = JSON.stringify(data);
    const tag = `"${createHash("sha1").update(dataJson).digest("base64url")}"`;
    if (req.headers.get("if-none-match") === tag) return new NextResponse(null, { status: 304, headers: { etag: tag } });
    const body = `${JSON.stringify({ now, window, open }).slice(0, -1)},${dataJson.slice(1)}`;
    return new NextResponse(body, { headers: { "content-type": "application/json", etag: tag, "cache-control": "private, no-cache" } });
  } catch (e) {
    return errorResponse(e);
  }
}
