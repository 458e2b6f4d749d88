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

export function recallMail(input: {
  organisationName: string;
  recallNumber: string;
  loadNumber: string;
  reason: string;
  sets: { serial: string; typeName: string; siteName: string }[];
  link: string;
}): RenderedMail {
  const subject = `Recall ${input.recallNumber}: ${input.sets.length} set${input.sets.length === 1 ? "" : "s"} of ${input.organisationName} must not be used`;
  const lines = input.sets.map((s) => `- ${s.serial} ${s.typeName} (${s.siteName})`);
  const text = [
    `Hello,`,
    "",
    `Steriliser load ${input.loadNumber} has failed after release. Do not use the sets below; keep them apart and send them back to the unit.`,
    `Reason: ${input.reason}`,
    "",
    ...lines,
    "",
    `The recall, with the sets and their procedures: ${input.link}`,
    "",
    "This notice is advisory; follow your own validated procedures, qualified staff and local regulations on patient follow-up.",
  ].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello,</p>
<p>Steriliser load <strong>${escapeHtml(input.loadNumber)}</strong> has failed after release. <strong>Do not use the sets below</strong>; keep them apart and send them back to the unit.</p>
<p>Reason: ${escapeHtml(input.reason)}</p>
<ul>${input.sets.map((s) => `<li>${escapeHtml(s.serial)} ${escapeHtml(s.typeName)} (${escapeHtml(s.siteName)})</li>`).join("")}</ul>
${mailButton(input.link, "Open the recall")}
<p style="font-size:12px;color:#555">This notice is advisory; follow your own validated procedures, qualified staff and local regulations on patient follow-up.</p>`,
  );
  return { subject, text, html };
}
