// GET /api/queue/board: the Floor's lanes, plates, attended spells and waiting list (operators, admins), with an ETag for cheap polling.
import { createHash } from "node:crypto";
import { NextResponse } from "next/server";
import { errorResponse } from "@/lib/server/errors";
import { floorBoard } from "@/lib/server/queue";
import { requireUser } from "@/lib/server/session";

export async function GET(req: Request) {
  try {
    const user = await requireUser("queue:manage");
    const board = await floorBoard(user);
    // The clock moves every poll; hash what changes with the data, not the time.
    const { now: _now, window: _w, open: _o, ...data } = board;
    const tag = `"${createHash("sha1").update(JSON.stringify(data)).digest("base64url")}"`;
    if (req.headers.get("if-none-match") === tag) return new NextResponse(null, { status: 304, headers: { etag: tag } });
    return NextResponse.json(board, { headers: { etag: tag, "cache-control": "private, no-cache" } });
  } catch (e) {
    return errorResponse(e);
  }
}
