// A local fake of the few payment-provider endpoints Platewright uses: create and read a checkout
// session, a human checkout page with a Pay button, and the signed checkout.session.completed event
// sent to the app's webhook. Loopback only; it never delivers to any other host.
import { randomBytes } from "node:crypto";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import Stripe from "stripe";
import { parseForm, str, type FormValue } from "./form";

export interface FakeSession {
  id: string;
  object: "checkout.session";
  mode: string;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_total: number;
  currency: string;
  success_url: string;
  cancel_url: string | null;
  client_reference_id: string | null;
  metadata: Record<string, string>;
  url: string;
  created: number;
  line_items_summary: string;
}

export interface SignedEvent {
  payload: string;
  header: string;
  eventId: string;
}

export interface PaymentsFake {
  port: number;
  sessions: Map<string, FakeSession>;
  /** Marks a session paid and makes its signed event; delivers it to the webhook unless told not to. */
  complete(id: string, opts?: { deliver?: boolean }): Promise<SignedEvent>;
  /** Sends the last event again, freshly signed (a replay, as providers do on retries). */
  resendLast(): Promise<SignedEvent | null>;
  close(): Promise<void>;
}

const isLoopback = (url: string) => {
  try {
    const h = new URL(url).hostname;
    return h === "localhost" || h === "[::1]" || /^127\.\d+\.\d+\.\d+$/.test(h);
  } catch {
    return false;
  }
};

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

function json(res: ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { "content-type": "application/json" });
  res.end(JSON.stringify(body));
}

function apiError(res: ServerResponse, status: number, message: string) {
  json(res, status, { error: { type: "invalid_request_error", message } });
}

export async function startPaymentsFake(opts: { port: number; webhookSecret: string; defaultWebhookUrl: string; host?: string }): Promise<PaymentsFake> {
  const host = opts.host ?? "127.0.0.1";
  const sessions = new Map<string, FakeSession>();
  const byIdempotencyKey = new Map<string, string>();
  let last: { payload: string; url: string } | null = null;
  let base = "";

  function webhookUrlFor(s: FakeSession): string {
    const wanted = s.metadata.pw_fake_webhook_url;
    return wanted && isLoopback(wanted) ? wanted : opts.defaultWebhookUrl;
  }

  async function deliver(payload: string, url: string): Promise<SignedEvent> {
    const header = Stripe.webhooks.generateTestHeaderString({ payload, secret: opts.webhookSecret });
    const eventId = (JSON.parse(payload) as { id: string }).id;
    if (!isLoopback(url)) throw new Error(`the payment fake delivers only to loopback, not ${url}`);
    const res = await fetch(url, { method: "POST", headers: { "content-type": "application/json", "stripe-signature": header }, body: payload, signal: AbortSignal.timeout(10_000) });
    if (!res.ok) console.error(`[payments-fake] webhook ${url} answered ${res.status}`);
    return { payload, header, eventId };
  }

  async function complete(id: string, o: { deliver?: boolean } = {}): Promise<SignedEvent> {
    const s = sessions.get(id);
    if (!s) throw new Error(`no checkout session ${id}`);
    s.status = "complete";
    s.payment_status = "paid";
    const event = {
      id: `evt_${randomBytes(12).toString("hex")}`,
      object: "event",
      type: "checkout.session.completed",
      api_version: Stripe.API_VERSION,
      created: Math.floor(Date.now() / 1000),
      livemode: false,
      data: { object: s },
    };
    const payload = JSON.stringify(event);
    last = { payload, url: webhookUrlFor(s) };
    if (o.deliver === false) {
      return { payload, header: Stripe.webhooks.generateTestHeaderString({ payload, secret: opts.webhookSecret }), eventId: event.id };
    }
    return deliver(payload, last.url);
  }

  async function resendLast(): Promise<SignedEvent | null> {
    return last ? deliver(last.payload, last.url) : null;
  }

  function createSession(form: Record<string, FormValue>): FakeSession | string {
    const items = Array.isArray(form.line_items) ? form.line_items : [];
    let total = 0;
    let currency = "";
    const names: string[] = [];
    for (const it of items) {
      if (typeof it !== "object" || Array.isArray(it)) return "line_items must be objects";
      const pd = it.price_data as Record<string, FormValue> | undefined;
      const amount = Number(str(pd?.unit_amount));
      const qty = Number(str(it.quantity) ?? "1");
      if (!Number.isInteger(amount) || amount < 1 || !Number.isInteger(qty) || qty < 1) return "unit_amount and quantity must be positive integers";
      currency = str(pd?.currency) ?? currency;
      total += amount * qty;
      const product = pd?.product_data as Record<string, FormValue> | undefined;
      names.push(str(product?.name) ?? "item");
    }
    const successUrl = str(form.success_url);
    if (!items.length || !currency) return "line_items with price_data are required";
    if (!successUrl) return "success_url is required";
    const id = `cs_test_${randomBytes(16).toString("hex")}`;
    const metadata: Record<string, string> = {};
    if (form.metadata && typeof form.metadata === "object" && !Array.isArray(form.metadata)) {
      for (const [k, v] of Object.entries(form.metadata)) if (typeof v === "string") metadata[k] = v;
    }
    const s: FakeSession = {
      id,
      object: "checkout.session",
      mode: str(form.mode) ?? "payment",
      status: "open",
      payment_status: "unpaid",
      amount_total: total,
      currency,
      success_url: successUrl,
      cancel_url: str(form.cancel_url) ?? null,
      client_reference_id: str(form.client_reference_id) ?? null,
      metadata,
      url: `${base}/pay/${id}`,
      created: Math.floor(Date.now() / 1000),
      line_items_summary: names.join(", "),
    };
    sessions.set(id, s);
    return s;
  }

  function page(s: FakeSession): string {
    const amount = `${(s.amount_total / 100).toFixed(2)} ${s.currency.toUpperCase()}`;
    const done = s.payment_status === "paid";
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Test checkout</title>
<style>body{font-family:system-ui,sans-serif;max-width:28rem;margin:4rem auto;padding:0 1rem;color:#222}
button{font-size:1rem;padding:.6rem 1.4rem;margin-right:.5rem}.note{color:#666;font-size:.85rem}</style></head>
<body><p class="note">Local test checkout: no real money moves.</p><h1>Pay ${esc(amount)}</h1>
<p>${esc(s.line_items_summary)}</p>
${done ? "<p>This session is already paid.</p>" : `<form method="post" action="/pay/${esc(s.id)}"><button type="submit">Pay</button></form>`}
${s.cancel_url && !done ? `<form method="post" action="/pay/${esc(s.id)}/cancel"><button type="submit">Cancel</button></form>` : ""}
</body></html>`;
  }

  const server = createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? "/", base || "http://127.0.0.1");
      const parts = url.pathname.split("/").filter(Boolean);
      if (parts[0] === "v1") {
        const auth = req.headers.authorization ?? "";
        if (!/^Bearer sk_test_/.test(auth)) return apiError(res, 401, "Use a test secret key (sk_test_…).");
        if (req.method === "POST" && url.pathname === "/v1/checkout/sessions") {
          const key = req.headers["idempotency-key"];
          const seen = typeof key === "string" ? byIdempotencyKey.get(key) : undefined;
          if (seen) return json(res, 200, sessions.get(seen));
          const made = createSession(parseForm(await readBody(req)));
          if (typeof made === "string") return apiError(res, 400, made);
          if (typeof key === "string") byIdempotencyKey.set(key, made.id);
          return json(res, 200, made);
        }
        if (req.method === "GET" && parts[1] === "checkout" && parts[2] === "sessions" && parts[3]) {
          const s = sessions.get(parts[3]);
          return s ? json(res, 200, s) : apiError(res, 404, `No such checkout.session: '${parts[3]}'`);
        }
        return apiError(res, 404, `Unrecognized request URL (${req.method}: ${url.pathname}).`);
      }
      if (parts[0] === "pay" && parts[1]) {
        const s = sessions.get(parts[1]);
        if (!s) return void res.writeHead(404, { "content-type": "text/plain" }).end("No such checkout session.");
        if (req.method === "GET") return void res.writeHead(200, { "content-type": "text/html; charset=utf-8" }).end(page(s));
        if (req.method === "POST" && parts[2] === "cancel") {
          return void res.writeHead(303, { location: s.cancel_url ?? s.success_url }).end();
        }
        if (req.method === "POST") {
          if (s.payment_status !== "paid") await complete(s.id).catch((e: unknown) => console.error("[payments-fake] delivery failed:", e));
          return void res.writeHead(303, { location: s.success_url.replace("{CHECKOUT_SESSION_ID}", s.id) }).end();
        }
      }
      if (req.method === "POST" && url.pathname === "/_fake/resend-last") {
        const sent = await resendLast().catch(() => null);
        return json(res, sent ? 200 : 404, sent ? { resent: sent.eventId } : { error: "no event yet" });
      }
      if (url.pathname === "/_fake/health") return json(res, 200, { ok: true });
      res.writeHead(404, { "content-type": "text/plain" }).end("Not found");
    })().catch((e: unknown) => {
      console.error("[payments-fake]", e);
      if (!res.headersSent) apiError(res, 500, "fake failed");
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, host, () => resolve());
  });
  const addr = server.address();
  const port = typeof addr === "object" && addr ? addr.port : opts.port;
  base = `http://${host}:${port}`;
  return { port, sessions, complete, resendLast, close: () => new Promise<void>((r) => server.close(() => r())) };
}
