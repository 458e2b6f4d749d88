import type { Metadata } from "next";
import Link from "next/link";
import { getDb } from "@/db";
import { AppError } from "@/lib/errors";
import { describeInvitation } from "@/lib/users/service";
import { AcceptInviteForm } from "./accept-invite-form";

export const metadata: Metadata = { title: "Choose your password" };

export default async function AcceptInvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = await describeInvitation(getDb(), token).catch((error: unknown) => {
    if (error instanceof AppError) return error;
    throw error;
  });
  if (!(invitation instanceof AppError)) {
    return (
      <>
        <h1 className="mb-1 text-xl font-semibold">Welcome, {invitation.name}</h1>
        <p className="mb-6 text-sm text-muted">
          Choose a password for {invitation.email} at {invitation.organisationName}.
        </p>
        <AcceptInviteForm token={token} email={invitation.email} />
      </>
    );
  }
  return (
    <>
      <h1 className="mb-2 text-xl font-semibold">This link cannot be used</h1>
      <p role="alert" className="text-sm text-ink-soft">
        {invitation.message}
      </p>
      <Link href="/sign-in" className="mt-6 inline-block text-sm font-medium text-lagoon-700 underline">
        Go to sign in
      </Link>
    </>
  );
}
