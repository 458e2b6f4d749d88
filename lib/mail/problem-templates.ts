import { escapeHtml, mailButton, mailFrame } from "./html";
import type { RenderedMail } from "./templates";

// The message a clinic gets when the unit has answered a problem it reported. It carries only
// the recipient's own organisation's problem; everything people typed is escaped in the HTML.

export interface ProblemAnsweredContext {
  recipientName: string;
  problemNumber: number;
  kindLabel: string;
  orderReference: string | null;
  /** "QMH-000012 — Major laparotomy tray", or null for a problem about the whole order. */
  setLabel: string | null;
  siteName: string;
  reportedAt: string;
  description: string;
  answer: string;
  answeredByName: string;
  answeredAt: string;
  link: string;
}

/** Keeps the line breaks of a text someone typed, after escaping it. */
function paragraphsHtml(text: string): string {
  return text
    .split(/\n{2,}/)
    .map((p) => `<p style="margin:0 0 8px">${escapeHtml(p).replaceAll("\n", "<br>")}</p>`)
    .join("");
}

function quote(text: string): string {
  return text
    .split("\n")
    .map((line) => `  > ${line}`)
    .join("\n");
}

export function problemAnsweredMail(ctx: ProblemAnsweredContext): RenderedMail {
  const about = [ctx.orderReference ? `order ${ctx.orderReference}` : null, ctx.setLabel ? `set ${ctx.setLabel}` : null].filter(Boolean).join(", ");
  const subject = `Problem ${ctx.problemNumber} answered${ctx.orderReference ? ` (${ctx.orderReference})` : ""}: ${ctx.kindLabel}`;
  const text = [
    `Hello ${ctx.recipientName},`,
    "",
    `Larkmoor Sterile Services has answered problem ${ctx.problemNumber}, reported for ${ctx.siteName} on ${ctx.reportedAt}${about ? ` about ${about}` : ""}: ${ctx.kindLabel}.`,
    "",
    "What was reported:",
    quote(ctx.description),
    "",
    `The answer, from ${ctx.answeredByName} on ${ctx.answeredAt}:`,
    quote(ctx.answer),
    "",
    `See the problem: ${ctx.link}`,
  ].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(ctx.recipientName)},</p>
<p>Larkmoor Sterile Services has answered problem ${ctx.problemNumber}, reported for ${escapeHtml(ctx.siteName)} on ${escapeHtml(ctx.reportedAt)}${about ? ` about ${escapeHtml(about)}` : ""}: <strong>${escapeHtml(ctx.kindLabel)}</strong>.</p>
<p style="margin:16px 0 4px;color:#6b6f68">What was reported</p>
<div style="border-left:3px solid #ddd8cc;padding:4px 12px">${paragraphsHtml(ctx.description)}</div>
<p style="margin:16px 0 4px;color:#6b6f68">The answer, from ${escapeHtml(ctx.answeredByName)} on ${escapeHtml(ctx.answeredAt)}</p>
<div style="border-left:3px solid #0f5e63;padding:4px 12px">${paragraphsHtml(ctx.answer)}</div>
${mailButton(ctx.link, "See the problem")}`,
  );
  return { subject, text, html };
}
