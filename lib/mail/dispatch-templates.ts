import { escapeHtml, mailButton, mailFrame } from "./html";
import type { RenderedMail } from "./templates";

// The expected-time notice of a van visit: sent when the day's plan is published, and again
// only when a later change moves the time; and the notice that a visit the site was told about
// is off the runs.

export interface ExpectedVisitMailContext {
  recipientName: string | null;
  siteName: string;
  /** "Wednesday 2 December 2026". */
  dayText: string;
  /** "10:40". */
  expectedText: string;
  /** "10:25 and 10:55": the half-hour around the expected time. */
  rangeText: string;
  collectReferences: string[];
  deliverReferences: string[];
  /** Number of sets to deliver. */
  deliverSets: number;
  link: string;
  update: boolean;
}

export function expectedVisitMail(ctx: ExpectedVisitMailContext): RenderedMail {
  const subject = ctx.update
    ? `New time for the van at ${ctx.siteName}: ${ctx.expectedText}`
    : `The van visits ${ctx.siteName} around ${ctx.expectedText} on ${ctx.dayText}`;
  const what: string[] = [];
  if (ctx.collectReferences.length > 0) what.push(`collect the sets of ${ctx.collectReferences.join(", ")}`);
  if (ctx.deliverReferences.length > 0) what.push(`bring back ${ctx.deliverSets} set${ctx.deliverSets === 1 ? "" : "s"} (${ctx.deliverReferences.join(", ")})`);
  const paragraphs = [
    `${ctx.update ? "The van's time has changed. " : ""}Our van is expected at ${ctx.siteName} on ${ctx.dayText} around ${ctx.expectedText}, between ${ctx.rangeText}.`,
    `The driver will ${what.join(" and ")}.`,
    "Times are planned estimates: traffic and earlier stops can move them. Please have the sets ready and someone to sign for deliveries.",
  ];
  const greeting = ctx.recipientName ? `Hello ${ctx.recipientName},` : "Hello,";
  const text = [greeting, "", ...paragraphs, "", `Your orders: ${ctx.link}`].join("\n");
  const html = mailFrame(
    subject,
    `<p>${escapeHtml(greeting)}</p>${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("")}${mailButton(ctx.link, "See your orders")}`,
  );
  return { subject, text, html };
}

export interface VisitWithdrawnMailContext {
  recipientName: string | null;
  siteName: string;
  /** "Wednesday 2 December 2026". */
  dayText: string;
  /** The time the site was told, "10:40". */
  toldText: string;
  collectReferences: string[];
  deliverReferences: string[];
  link: string;
}

/** A visit the site was told about is off that day's runs: say so, so nobody waits for the van. */
export function visitWithdrawnMail(ctx: VisitWithdrawnMailContext): RenderedMail {
  const subject = `The van will not come to ${ctx.siteName} on ${ctx.dayText} as planned`;
  const what: string[] = [];
  if (ctx.collectReferences.length > 0) what.push(`collecting ${ctx.collectReferences.join(", ")}`);
  if (ctx.deliverReferences.length > 0) what.push(`bringing back ${ctx.deliverReferences.join(", ")}`);
  const paragraphs = [
    `We told you our van would come to ${ctx.siteName} on ${ctx.dayText} around ${ctx.toldText}. That visit is no longer on the day's runs${what.length > 0 ? ` (${what.join(" and ")})` : ""}.`,
    "We will e-mail you the new time as soon as the visit is planned again. If the sets are needed sooner, please contact the unit.",
  ];
  const greeting = ctx.recipientName ? `Hello ${ctx.recipientName},` : "Hello,";
  const text = [greeting, "", ...paragraphs, "", `Your orders: ${ctx.link}`].join("\n");
  const html = mailFrame(
    subject,
    `<p>${escapeHtml(greeting)}</p>${paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("")}${mailButton(ctx.link, "See your orders")}`,
  );
  return { subject, text, html };
}
