// The words of each message, in plain text and HTML. Everything interpolated into HTML is escaped.
import type { MessageKind } from "@/db/schema/mail";

export interface MessageData {
  invitation: { to: string; inviterName: string; link: string; expiresAt: Date };
  password_reset: { userId: number; link: string; expiresAt: Date };
  part_printed: { userId: number; partName: string; assemblyName?: string; plateLabel?: string };
  plate_failed: { userId: number; plateLabel: string; partNames: string[]; reason?: string };
  operator_digest: { userId: number; periodLabel: string; lines: string[] };
}

export interface Rendered {
  subject: string;
  text: string;
  html: string;
}

export interface Context {
  recipientName: string;
  workshopName: string;
  appUrl: string;
}

export const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c);

const when = (d: Date) => d.toISOString().slice(0, 16).replace("T", " ") + " UTC";

function layout(ctx: Context, paragraphs: string[], action?: { label: string; href: string }): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 12px">${p}</p>`).join("");
  const button = action
    ? `<p style="margin:20px 0"><a href="${escapeHtml(action.href)}" style="background:#1f6f6b;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(action.label)}</a></p>`
    : "";
  return `<!doctype html><html><body style="font-family:system-ui,sans-serif;color:#1d1c1a;background:#f7f4ee;padding:24px">
<div style="max-width:560px;margin:0 auto;background:#fff;border:1px solid #e2ddd2;border-radius:8px;padding:24px">
<p style="margin:0 0 16px;font-weight:600;color:#1f6f6b">${escapeHtml(ctx.workshopName)}</p>${body}${button}
<p style="margin:24px 0 0;font-size:12px;color:#6b665d">Sent by Platewright. Choose which messages you get under Account in ${escapeHtml(ctx.workshopName)}.</p>
</div></body></html>`;
}

const footer = (ctx: Context) => `\n\n-- \nSent by Platewright for ${ctx.workshopName}. Message settings: ${ctx.appUrl}/account`;

type Renderers = { [K in MessageKind]: (d: MessageData[K], ctx: Context) => Rendered };

const renderers: Renderers = {
  invitation: (d, ctx) => ({
    subject: `You are invited to ${ctx.workshopName}`,
    text: `Hello,\n\n${d.inviterName} invited you to join ${ctx.workshopName} on Platewright as a member.\n\nSet your name and password here (the link works once and expires ${when(d.expiresAt)}):\n${d.link}${footer(ctx)}`,
    html: layout(
      ctx,
      [
        "Hello,",
        `${escapeHtml(d.inviterName)} invited you to join ${escapeHtml(ctx.workshopName)} on Platewright as a member.`,
        `The link works once and expires ${escapeHtml(when(d.expiresAt))}.`,
      ],
      { label: "Accept the invitation", href: d.link },
    ),
  }),
  password_reset: (d, ctx) => ({
    subject: `Reset your ${ctx.workshopName} password`,
    text: `Hello ${ctx.recipientName},\n\nSomeone asked to reset the password of your account. If it was you, choose a new one here (the link works once and expires ${when(d.expiresAt)}):\n${d.link}\n\nIf it was not you, ignore this message; your password stays as it is.${footer(ctx)}`,
    html: layout(
      ctx,
      [
        `Hello ${escapeHtml(ctx.recipientName)},`,
        `Someone asked to reset the password of your account. The link works once and expires ${escapeHtml(when(d.expiresAt))}.`,
        "If it was not you, ignore this message; your password stays as it is.",
      ],
      { label: "Choose a new password", href: d.link },
    ),
  }),
  part_printed: (d, ctx) => {
    const what = d.assemblyName ? `${d.partName} (${d.assemblyName})` : d.partName;
    return {
      subject: `Printed and ready to collect: ${d.partName}`,
      text: `Hello ${ctx.recipientName},\n\n${what} has been printed${d.plateLabel ? ` on ${d.plateLabel}` : ""} and is ready to collect at ${ctx.workshopName}.\n\nYour Bench: ${ctx.appUrl}/bench${footer(ctx)}`,
      html: layout(
        ctx,
        [`Hello ${escapeHtml(ctx.recipientName)},`, `<strong>${escapeHtml(what)}</strong> has been printed${d.plateLabel ? ` on ${escapeHtml(d.plateLabel)}` : ""} and is ready to collect.`],
        { label: "Open your Bench", href: `${ctx.appUrl}/bench` },
      ),
    };
  },
  plate_failed: (d, ctx) => ({
    subject: `A plate failed; your parts are back in the queue`,
    text: `Hello ${ctx.recipientName},\n\n${d.plateLabel} failed${d.reason ? ` (${d.reason})` : ""}. These parts of yours are back in the queue and will be printed again:\n${d.partNames.map((n) => `- ${n}`).join("\n")}\n\nNothing for you to do.${footer(ctx)}`,
    html: layout(ctx, [
      `Hello ${escapeHtml(ctx.recipientName)},`,
      `${escapeHtml(d.plateLabel)} failed${d.reason ? ` (${escapeHtml(d.reason)})` : ""}. These parts of yours are back in the queue and will be printed again:`,
      `<ul>${d.partNames.map((n) => `<li>${escapeHtml(n)}</li>`).join("")}</ul>`,
      "Nothing for you to do.",
    ]),
  }),
  operator_digest: (d, ctx) => ({
    subject: `${ctx.workshopName}: the week on the Floor (${d.periodLabel})`,
    text: `Hello ${ctx.recipientName},\n\n${d.periodLabel}\n\n${d.lines.map((l) => `- ${l}`).join("\n")}\n\nThe Floor: ${ctx.appUrl}/floor${footer(ctx)}`,
    html: layout(
      ctx,
      [`Hello ${escapeHtml(ctx.recipientName)},`, escapeHtml(d.periodLabel), `<ul>${d.lines.map((l) => `<li>${escapeHtml(l)}</li>`).join("")}</ul>`],
      { label: "Open the Floor", href: `${ctx.appUrl}/floor` },
    ),
  }),
};

export function render<K extends MessageKind>(kind: K, data: MessageData[K], ctx: Context): Rendered {
  return (renderers[kind] as (d: MessageData[K], c: Context) => Rendered)(data, ctx);
}
