// The role matrix: for every route handler, the answer each caller must get. Writes are sent a body
// that is valid JSON but fails validation ({ "__bad": 1 }: every input schema is strict), so an allowed
// caller gets 422 and a refused one 401/403/404 — which also shows the role and ownership checks run
// before validation. Calls without a body are made on the real object by refused callers (it must
// still be there afterwards) and on a throwaway object by the allowed ones.
// Rules (lib/permissions.ts, lib/server/assemblies.ts accessTo, lib/server/parts.ts partAccess): a
// member who may not read another member's object gets 404; the workshop reads members' assemblies and
// parts but gets 403 on member edits.
import type { APIRequestContext } from "@playwright/test";
import type { Caller, Fixtures } from "./security-fixtures";

export type Expect = number | readonly number[] | `skip: ${string}`;
export type BodyKind = "invalid-json" | "none" | "upload";

export interface MatrixRow {
  path: (fx: Fixtures) => string;
  body: BodyKind;
  expect: Record<Caller, Expect>;
  /** Callers who are allowed a destructive call act on a throwaway made by `make` (returns the path). */
  throwaway?: { callers: Caller[]; make: (api: APIRequestContext, fx: Fixtures) => Promise<string> };
  /** Read as the owner after every refused call: must still answer 200. */
  stillThere?: (fx: Fixtures) => string;
}

const bad = "invalid-json" as const;
const all = (s: Expect): Record<Caller, Expect> => ({ anon: s, owner: s, other: s, operator: s, admin: s });
const signedIn = (s: Expect): Record<Caller, Expect> => ({ anon: 401, owner: s, other: s, operator: s, admin: s });
/** A member's own object: owner allowed, other member 404, workshop reads. */
const ownRead: Record<Caller, Expect> = { anon: 401, owner: 200, other: 404, operator: 200, admin: 200 };
/** A member's own object, edited: the workshop is refused by role (403). */
const ownWrite: Record<Caller, Expect> = { anon: 401, owner: 422, other: 404, operator: 403, admin: 403 };
const membersOnly = (s: Expect): Record<Caller, Expect> => ({ anon: 401, owner: s, other: s, operator: 403, admin: 403 });
const staff = (s: Expect): Record<Caller, Expect> => ({ anon: 401, owner: 403, other: 403, operator: s, admin: s });
const adminOnly = (s: Expect): Record<Caller, Expect> => ({ anon: 401, owner: 403, other: 403, operator: 403, admin: s });

async function throwawayAssembly(api: APIRequestContext): Promise<number> {
  const res = await api.post("/api/assemblies", { data: { name: `Matrix throwaway ${Date.now()}` } });
  if (res.status() !== 201) throw new Error(`throwaway assembly: ${res.status()} ${await res.text()}`);
  return ((await res.json()) as { id: number }).id;
}

async function throwawayChild(api: APIRequestContext, kind: "parts" | "items"): Promise<number> {
  const asm = await throwawayAssembly(api);
  const data = kind === "parts" ? { name: "Matrix spacer", quantity: 1, material: "PLA" } : { kind: "hardware", name: "Matrix washer", quantity: 1 };
  const res = await api.post(`/api/assemblies/${asm}/${kind}`, { data });
  if (res.status() !== 201) throw new Error(`throwaway ${kind}: ${res.status()} ${await res.text()}`);
  return ((await res.json()) as { id: number }).id;
}

export const matrix: Record<string, MatrixRow> = {
  // Public endpoints.
  "GET /api/health": { path: () => "/api/health", body: "none", expect: all(200) },
  "GET /api/auth/[...nextauth]": { path: () => "/api/auth/csrf", body: "none", expect: all(200) },
  // Without the CSRF token next-auth sends the caller back to sign-in (no session is made).
  "POST /api/auth/[...nextauth]": { path: () => "/api/auth/callback/credentials", body: "none", expect: all(302) },
  "POST /api/invitations/accept": { path: () => "/api/invitations/accept", body: bad, expect: all(422) },
  "POST /api/password-reset": { path: () => "/api/password-reset", body: bad, expect: all(422) },
  "POST /api/password-reset/confirm": { path: () => "/api/password-reset/confirm", body: bad, expect: all(422) },
  // No signature header: refused before anything is read.
  "POST /api/webhooks/payments": { path: () => "/api/webhooks/payments", body: bad, expect: all(400) },

  // Anyone signed in.
  "GET /api/me": { path: () => "/api/me", body: "none", expect: signedIn(200) },
  "GET /api/mail/preferences": { path: () => "/api/mail/preferences", body: "none", expect: signedIn(200) },
  "PUT /api/mail/preferences": { path: () => "/api/mail/preferences", body: bad, expect: signedIn(422) },
  "GET /api/printers": { path: () => "/api/printers", body: "none", expect: signedIn(200) },
  "GET /api/printers/[id]": { path: (f) => `/api/printers/${f.printerId}`, body: "none", expect: signedIn(200) },
  "GET /api/workshop/hours": { path: () => "/api/workshop/hours", body: "none", expect: signedIn(200) },
  "POST /api/quotes": { path: () => "/api/quotes", body: bad, expect: signedIn(422) },
  "POST /api/quotes/assembly": { path: () => "/api/quotes/assembly", body: bad, expect: signedIn(422) },

  // Members' assemblies, parts, items and files.
  "GET /api/assemblies": { path: () => "/api/assemblies", body: "none", expect: membersOnly(200) },
  "POST /api/assemblies": { path: () => "/api/assemblies", body: bad, expect: membersOnly(422) },
  "GET /api/assemblies/[id]": { path: (f) => `/api/assemblies/${f.assemblyId}`, body: "none", expect: ownRead },
  "PATCH /api/assemblies/[id]": { path: (f) => `/api/assemblies/${f.assemblyId}`, body: bad, expect: ownWrite },
  "DELETE /api/assemblies/[id]": {
    path: (f) => `/api/assemblies/${f.subAssemblyId}`,
    body: "none",
    expect: { anon: 401, owner: 204, other: 404, operator: 403, admin: 403 },
    throwaway: { callers: ["owner"], make: async (api) => `/api/assemblies/${await throwawayAssembly(api)}` },
    stillThere: (f) => `/api/assemblies/${f.subAssemblyId}`,
  },
  "GET /api/assemblies/[id]/bom": { path: (f) => `/api/assemblies/${f.assemblyId}/bom`, body: "none", expect: ownRead },
  "GET /api/assemblies/[id]/shares": {
    path: (f) => `/api/assemblies/${f.assemblyId}/shares`,
    body: "none",
    expect: { anon: 401, owner: 200, other: 404, operator: 403, admin: 403 },
  },
  "POST /api/assemblies/[id]/shares": { path: (f) => `/api/assemblies/${f.assemblyId}/shares`, body: bad, expect: ownWrite },
  // Removing a share Priya does not have changes nothing, so the owner may call it on the real assembly.
  "DELETE /api/assemblies/[id]/shares": {
    path: (f) => `/api/assemblies/${f.assemblyId}/shares?userId=${f.priyaId}`,
    body: "none",
    expect: { anon: 401, owner: 204, other: 404, operator: 403, admin: 403 },
  },
  "POST /api/assemblies/[id]/items": { path: (f) => `/api/assemblies/${f.subAssemblyId}/items`, body: bad, expect: ownWrite },
  "POST /api/assemblies/[id]/parts": { path: (f) => `/api/assemblies/${f.subAssemblyId}/parts`, body: bad, expect: ownWrite },
  "PATCH /api/items/[itemId]": { path: (f) => `/api/items/${f.itemId}`, body: bad, expect: ownWrite },
  "DELETE /api/items/[itemId]": {
    path: (f) => `/api/items/${f.itemId}`,
    body: "none",
    expect: { anon: 401, owner: 204, other: 404, operator: 403, admin: 403 },
    throwaway: { callers: ["owner"], make: async (api) => `/api/items/${await throwawayChild(api, "items")}` },
    stillThere: (f) => `/api/assemblies/${f.assemblyId}`,
  },
  "GET /api/parts": { path: () => "/api/parts", body: "none", expect: membersOnly(200) },
  "GET /api/parts/[partId]": { path: (f) => `/api/parts/${f.partId}`, body: "none", expect: ownRead },
  "PATCH /api/parts/[partId]": { path: (f) => `/api/parts/${f.partId}`, body: bad, expect: ownWrite },
  "DELETE /api/parts/[partId]": {
    path: (f) => `/api/parts/${f.partId}`,
    body: "none",
    expect: { anon: 401, owner: 204, other: 404, operator: 403, admin: 403 },
    throwaway: { callers: ["owner"], make: async (api) => `/api/parts/${await throwawayChild(api, "parts")}` },
    stillThere: (f) => `/api/parts/${f.partId}`,
  },
  // The workshop moves copies along (printed, accepted…), so staff reach validation too.
  "POST /api/parts/[partId]/status": {
    path: (f) => `/api/parts/${f.partId}/status`,
    body: bad,
    expect: { anon: 401, owner: 422, other: 404, operator: 422, admin: 422 },
  },
  // No ?name=: the owner is refused by validation (422); nobody else gets that far.
  "PUT /api/parts/[partId]/file": { path: (f) => `/api/parts/${f.partId}/file`, body: "upload", expect: ownWrite },
  "GET /api/parts/[partId]/orientation": { path: (f) => `/api/parts/${f.partId}/orientation`, body: "none", expect: ownRead },
  "PUT /api/parts/[partId]/orientation": { path: (f) => `/api/parts/${f.partId}/orientation`, body: bad, expect: ownWrite },
  "POST /api/parts/[partId]/orientation/search": { path: (f) => `/api/parts/${f.partId}/orientation/search`, body: bad, expect: ownWrite },
  "GET /api/parts/[partId]/split": { path: (f) => `/api/parts/${f.partId}/split`, body: "none", expect: ownRead },
  "POST /api/parts/[partId]/split": { path: (f) => `/api/parts/${f.partId}/split`, body: bad, expect: ownWrite },
  "POST /api/parts/[partId]/repair": { path: (f) => `/api/parts/${f.partId}/repair`, body: bad, expect: ownWrite },
  "POST /api/parts/[partId]/accept-mesh": { path: (f) => `/api/parts/${f.partId}/accept-mesh`, body: bad, expect: staff(422) },
  "GET /api/files/[fileId]": { path: (f) => `/api/files/${f.fileId}`, body: "none", expect: ownRead },
  "GET /api/queue/parts/[partId]": { path: (f) => `/api/queue/parts/${f.partId}`, body: "none", expect: ownRead },
  "GET /api/quotes/assembly/[id]": { path: (f) => `/api/quotes/assembly/${f.assemblyId}`, body: "none", expect: ownRead },

  // Queue and plates.
  "POST /api/queue": { path: () => "/api/queue", body: bad, expect: membersOnly(422) },
  "GET /api/queue": { path: () => "/api/queue", body: "none", expect: staff(200) },
  "GET /api/queue/board": { path: () => "/api/queue/board", body: "none", expect: staff(200) },
  "PATCH /api/queue/[id]": { path: (f) => `/api/queue/${f.queueEntryId}`, body: bad, expect: staff(422) },
  "POST /api/plan": {
    path: () => "/api/plan",
    body: "none",
    expect: { ...staff(200), operator: "skip: re-plans every plate; run twice at once in concurrency.spec", admin: "skip: re-plans every plate; run twice at once in concurrency.spec" },
  },
  // A member sees a plate only when a copy of theirs is on it (the fixture plate holds Jun's, not Priya's).
  "GET /api/plates/[id]": { path: (f) => `/api/plates/${f.plateId}`, body: "none", expect: { anon: 401, owner: 200, other: 404, operator: 200, admin: 200 } },
  "GET /api/plates/[id]/3mf": { path: (f) => `/api/plates/${f.plateId}/3mf`, body: "none", expect: staff(200) },
  "POST /api/plates/[id]/[action]": { path: (f) => `/api/plates/${f.plateId}/start`, body: bad, expect: staff(422) },

  // Printers, materials, spools (the workshop).
  "POST /api/printers": { path: () => "/api/printers", body: bad, expect: adminOnly(422) },
  "PATCH /api/printers/[id]": { path: (f) => `/api/printers/${f.printerId}`, body: bad, expect: adminOnly(422) },
  "DELETE /api/printers/[id]": {
    path: (f) => `/api/printers/${f.printerId}`,
    body: "none",
    expect: { ...adminOnly(204), admin: "skip: would remove a seeded printer other rows use; admin deletes are in printers.spec" },
    stillThere: (f) => `/api/printers/${f.printerId}`,
  },
  "PATCH /api/printers/[id]/state": { path: (f) => `/api/printers/${f.printerId}/state`, body: bad, expect: staff(422) },
  "POST /api/printers/[id]/history": { path: (f) => `/api/printers/${f.printerId}/history`, body: bad, expect: staff(422) },
  "GET /api/materials": { path: () => "/api/materials", body: "none", expect: staff(200) },
  "POST /api/materials": { path: () => "/api/materials", body: bad, expect: adminOnly(422) },
  "PATCH /api/materials/[id]": { path: (f) => `/api/materials/${f.materialId}`, body: bad, expect: adminOnly(422) },
  // The fixture material has spools, so even the admin's delete is refused (409) and nothing changes.
  "DELETE /api/materials/[id]": { path: (f) => `/api/materials/${f.materialId}`, body: "none", expect: adminOnly(409) },
  "POST /api/spools": { path: () => "/api/spools", body: bad, expect: staff(422) },
  "PATCH /api/spools/[id]": { path: (f) => `/api/spools/${f.spoolId}`, body: bad, expect: staff(422) },
  "PUT /api/spools/[id]/load": { path: (f) => `/api/spools/${f.spoolId}/load`, body: bad, expect: staff(422) },

  // Workshop settings, people, mail, money, insights.
  "GET /api/workshop/settings": { path: () => "/api/workshop/settings", body: "none", expect: staff(200) },
  "PATCH /api/workshop/settings": { path: () => "/api/workshop/settings", body: bad, expect: adminOnly(422) },
  "PUT /api/workshop/hours": { path: () => "/api/workshop/hours", body: bad, expect: adminOnly(422) },
  "GET /api/people": { path: () => "/api/people", body: "none", expect: adminOnly(200) },
  "PATCH /api/people/[id]": { path: (f) => `/api/people/${f.junId}`, body: bad, expect: adminOnly(422) },
  "GET /api/invitations": { path: () => "/api/invitations", body: "none", expect: adminOnly(200) },
  "POST /api/invitations": { path: () => "/api/invitations", body: bad, expect: adminOnly(422) },
  "GET /api/mail/outbox": { path: () => "/api/mail/outbox", body: "none", expect: adminOnly(200) },
  // No message has this id: the admin gets 404, the rest are stopped by role first.
  "POST /api/mail/outbox/[id]/retry": { path: () => "/api/mail/outbox/999999999/retry", body: "none", expect: adminOnly(404) },
  "GET /api/mail/mailbox": { path: () => "/api/mail/mailbox", body: "none", expect: adminOnly(200) },
  "GET /api/ledger": { path: () => "/api/ledger", body: "none", expect: membersOnly(200) },
  "GET /api/ledger/balances": { path: () => "/api/ledger/balances", body: "none", expect: adminOnly(200) },
  "GET /api/ledger/export": { path: () => "/api/ledger/export?kind=charges", body: "none", expect: adminOnly(200) },
  "POST /api/payments/checkout": {
    path: () => "/api/payments/checkout",
    body: "none",
    expect: { ...membersOnly(200), owner: "skip: opens a checkout at the payment fake; paid through in ledger-pay.spec", other: "skip: opens a checkout at the payment fake; paid through in ledger-pay.spec" },
  },
  "GET /api/insights": { path: () => "/api/insights", body: "none", expect: staff(200) },
  "GET /api/insights/[chart]": { path: () => "/api/insights/utilisation", body: "none", expect: staff(200) },
};

/** Server actions ("use server" files) and the answer each caller gets; none exist yet. */
export const serverActions: Record<string, Record<Caller, Expect>> = {};
