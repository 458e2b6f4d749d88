import { escapeHtml, mailButton, mailFrame } from "./html";
import type { RenderedMail } from "./templates";

// What the receiving station tells a clinic by e-mail: a set that arrived without a booking, and
// a booked set that did not arrive. Each message is about one notice of the recipient's own
// organisation; everything from the database is escaped in the HTML.

export interface ReceivingNoticeMailContext {
  recipientName: string;
  siteName: string;
  /** The pickup the notice belongs to, or null for a set that came on its own. */
  orderReference: string | null;
  serial: string;
  setName: string;
  /** When the unit recorded it, as the unit's local time ("1 Dec 2026, 10:05"). */
  at: string;
  /** The page to follow it on: the order's page, or the set's. */
  link: string;
  linkLabel: string;
}

function build(ctx: ReceivingNoticeMailContext, subject: string, paragraphs: string[]): RenderedMail {
  const text = [`Hello ${ctx.recipientName},`, "", ...paragraphs.flatMap((p) => [p, ""]), `${ctx.linkLabel}: ${ctx.link}`].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(ctx.recipientName)},</p>${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("")}${mailButton(ctx.link, ctx.linkLabel)}`,
  );
  return { subject, text, html };
}

/** A set reached the unit without being booked on a pickup. */
export function unexpectedSetMail(ctx: ReceivingNoticeMailContext, promised: string | null): RenderedMail {
  const withOrder = ctx.orderReference ? ` It came with pickup ${ctx.orderReference} from ${ctx.siteName}.` : ` It belongs to ${ctx.siteName}.`;
  return build(ctx, `${ctx.serial} arrived without a booking${ctx.orderReference ? ` (${ctx.orderReference})` : ""}`, [
    `Your set ${ctx.serial} (${ctx.setName}) was received at the unit on ${ctx.at} without being booked.${withOrder}`,
    promised
      ? `The unit is processing it at standard turnaround; it is due back by ${promised}.`
      : "The unit is processing it; it will tell you when it is due back.",
    "Please book every set you send on the pickup, so its return can be planned and it is not mistaken for another clinic's.",
  ]);
}

/** A set booked on a pickup was not among the sets the unit received. */
export function missingSetMail(ctx: ReceivingNoticeMailContext & { orderReference: string }): RenderedMail {
  return build(ctx, `${ctx.orderReference}: ${ctx.serial} did not arrive`, [
    `Your set ${ctx.serial} (${ctx.setName}) was booked on pickup ${ctx.orderReference} from ${ctx.siteName}, but it was not among the sets the unit received; receiving of the order was finished on ${ctx.at}.`,
    "Please check whether it is still at your site. If it turns up, send it on the next pickup; if it arrives at the unit later, it is processed as normal.",
  ]);
}
