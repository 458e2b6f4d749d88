import { escapeHtml, mailButton, mailFrame } from "./html";
import type { RenderedMail } from "./templates";

// The weekly list of sets nearing their expiry date, for one clinic user. It carries only the
// recipient's own organisation's sets (their own site's, for clinic staff).

export interface ExpiryDigestLine {
  serial: string;
  setName: string;
  siteName: string;
  /** "10 Dec 2026". */
  expiresOn: string;
  /** "Expires in 3 days", "Expired yesterday". */
  phrase: string;
  expired: boolean;
}

export interface ExpiryDigestContext {
  recipientName: string;
  organisationName: string;
  /** "Quillby Moor General – Main Theatres" or "all your sites". */
  scope: string;
  days: number;
  /** The ISO week the digest is for, e.g. "2026-W49". */
  week: string;
  link: string;
  settingsLink: string;
  lines: ExpiryDigestLine[];
}

export function expiryDigestMail(ctx: ExpiryDigestContext): RenderedMail {
  const expired = ctx.lines.filter((l) => l.expired).length;
  const subject = `${ctx.lines.length} ${ctx.lines.length === 1 ? "set" : "sets"} nearing expiry at ${ctx.scope} (week ${ctx.week.slice(-2)})`;
  const intro = `These sterile sets at ${ctx.scope} (${ctx.organisationName}) expire within ${ctx.days} days${expired ? `; ${expired} ${expired === 1 ? "has" : "have"} already expired and must not be used` : ""}. Send them back for reprocessing before their date, or use them first.`;
  const advisory = "This list is advisory: the date on each pack's label and your local procedures decide whether a set may be used.";
  const line = (l: ExpiryDigestLine) => `${l.serial} — ${l.setName}, ${l.siteName}: ${l.phrase.toLowerCase()} (${l.expiresOn})`;
  const text = [
    `Hello ${ctx.recipientName},`,
    "",
    intro,
    "",
    ...ctx.lines.map((l) => `  • ${line(l)}`),
    "",
    advisory,
    "",
    `See the list and send sets back: ${ctx.link}`,
    `Choose which e-mails you receive: ${ctx.settingsLink}`,
  ].join("\n");
  const rows = ctx.lines
    .map(
      (l) =>
        `<tr><td style="padding:4px 8px 4px 0;white-space:nowrap">${escapeHtml(l.serial)}</td><td style="padding:4px 8px">${escapeHtml(l.setName)}<br><span style="color:#6b6f68">${escapeHtml(l.siteName)}</span></td><td style="padding:4px 0 4px 8px;${l.expired ? "color:#a1261b;font-weight:bold" : ""}">${escapeHtml(l.phrase)}<br><span style="color:#6b6f68">${escapeHtml(l.expiresOn)}</span></td></tr>`,
    )
    .join("");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(ctx.recipientName)},</p><p>${escapeHtml(intro)}</p><table role="presentation" cellpadding="0" cellspacing="0" style="font-size:14px;border-collapse:collapse">${rows}</table><p style="font-size:13px;color:#6b6f68">${escapeHtml(advisory)}</p>${mailButton(ctx.link, "See sets nearing expiry")}<p style="font-size:13px"><a href="${escapeHtml(ctx.settingsLink)}" style="color:#0f5e63">Choose which e-mails you receive</a></p>`,
  );
  return { subject, text, html };
}
