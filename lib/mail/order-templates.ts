import { escapeHtml, mailButton, mailFrame } from "./html";
import type { RenderedMail } from "./templates";

// The order notifications: one function per kind, each with subject, plain text and HTML.
// They carry only the recipient's own organisation's order.

export interface OrderMailContext {
  recipientName: string;
  reference: string;
  siteName: string;
  link: string;
  sets: { serial: string; name: string }[];
  extras: { description: string; quantity: number }[];
}

function setList(ctx: OrderMailContext): { text: string; html: string } {
  const lines = [
    ...ctx.sets.map((s) => `${s.serial} — ${s.name}`),
    ...ctx.extras.map((e) => `${e.quantity} × ${e.description}`),
  ];
  return {
    text: lines.map((l) => `  • ${l}`).join("\n"),
    html: `<ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join("")}</ul>`,
  };
}

function build(ctx: OrderMailContext, subject: string, paragraphs: string[], withSets = true): RenderedMail {
  const list = setList(ctx);
  const text = [
    `Hello ${ctx.recipientName},`,
    "",
    ...paragraphs,
    ...(withSets ? ["", list.text] : []),
    "",
    `Follow the order: ${ctx.link}`,
  ].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(ctx.recipientName)},</p>${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("")}${withSets ? list.html : ""}${mailButton(ctx.link, "Follow the order")}`,
  );
  return { subject, text, html };
}

export function bookingConfirmedMail(ctx: OrderMailContext, when: { collection: string; promised: string }): RenderedMail {
  return build(ctx, `Pickup ${ctx.reference} booked for ${ctx.siteName}`, [
    `Your pickup ${ctx.reference} at ${ctx.siteName} is booked. The van collects between ${when.collection}.`,
    `The sets are promised back by ${when.promised}.`,
  ]);
}

export function collectedMail(ctx: OrderMailContext): RenderedMail {
  return build(ctx, `${ctx.reference}: sets collected`, [`The sets of ${ctx.reference} have been collected from ${ctx.siteName} and are on their way to the unit.`]);
}

export function readyMail(ctx: OrderMailContext): RenderedMail {
  return build(ctx, `${ctx.reference}: sets ready to return`, [
    `Every set of ${ctx.reference} has been processed and released. They go back to ${ctx.siteName} on the next delivery.`,
  ]);
}

export function outForDeliveryMail(ctx: OrderMailContext, expected: string | null): RenderedMail {
  return build(ctx, `${ctx.reference}: out for delivery`, [
    `The sets of ${ctx.reference} are on the van to ${ctx.siteName}.${expected ? ` Expected around ${expected}.` : ""}`,
  ]);
}

export function deliveredMail(ctx: OrderMailContext): RenderedMail {
  return build(ctx, `${ctx.reference}: delivered`, [
    `The sets of ${ctx.reference} have been delivered to ${ctx.siteName}. If anything is wrong with a set, report it from the order page.`,
  ]);
}
