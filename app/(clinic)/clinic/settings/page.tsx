import type { Metadata } from "next";
import { MailPreferencesForm } from "@/components/settings/mail-preferences-form";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { MAIL_KIND_LABELS, MAIL_KINDS } from "@/lib/orders/mail-preferences";
import { getMailPreferences } from "./preferences";

export const metadata: Metadata = { title: "Settings" };

// The clinic user's own settings: which notification e-mails they receive.
export default async function ClinicSettingsPage() {
  const user = await requirePermission("mail.preferences");
  const preferences = await getMailPreferences(getDb(), user);
  return (
    <>
      <PageHeader title="Settings" description={`Signed in as ${user.name} (${user.email}), ${user.organisationName}.`} />
      <MailPreferencesForm initial={preferences} kinds={MAIL_KINDS.map((kind) => ({ kind, label: MAIL_KIND_LABELS[kind] }))} email={user.email} />
    </>
  );
}
