import type { ReactNode } from "react";
import { Wordmark } from "@/components/shell/logo";

// Pages for people who are not signed in: a calm, centred card.
export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center justify-center px-4 py-10">
      <div className="mb-8">
        <Wordmark />
      </div>
      <div className="w-full max-w-sm rounded-card border border-line bg-surface p-6 shadow-card sm:p-8">{children}</div>
      <p className="mt-6 max-w-sm text-center text-xs text-muted">
        Instrument reprocessing for the clinics served by Larkmoor Sterile Services.
      </p>
    </div>
  );
}
