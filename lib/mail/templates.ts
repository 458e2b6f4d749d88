import { format } from "date-fns";
import { tz } from "@date-fns/tz";
import { escapeHtml, mailButton, mailFrame } from "./html";

// One function per message: what it says, as subject, plain text and HTML.

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

export function invitationMail(input: {
  inviteeName: string;
  inviterName: string;
  organisationName: string;
  roleLabel: string;
  link: string;
  expiresAt: Date;
  timeZone: string;
}): RenderedMail {
  const expires = format(input.expiresAt, "EEEE d MMMM yyyy 'at' HH:mm", { in: tz(input.timeZone) });
  const subject = `You are invited to Steamlane (${input.organisationName})`;
  const text = [
    `Hello ${input.inviteeName},`,
    "",
    `${input.inviterName} has invited you to Steamlane as ${input.roleLabel} for ${input.organisationName}.`,
    "Open this link to choose your password and sign in:",
    input.link,
    "",
    `The link works once and expires on ${expires}.`,
  ].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(input.inviteeName)},</p>
<p>${escapeHtml(input.inviterName)} has invited you to Steamlane as <strong>${escapeHtml(input.roleLabel)}</strong> for ${escapeHtml(input.organisationName)}.</p>
${mailButton(input.link, "Choose your password")}
<p>The link works once and expires on ${escapeHtml(expires)}. If the button does not work, copy this address into your browser:<br><span style="word-break:break-all">${escapeHtml(input.link)}</span></p>`,
  );
  return { subject, text, html };
}
