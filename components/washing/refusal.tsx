import { CircleAlert } from "lucide-react";
import type { ReactNode } from "react";

/** A refused step at a station, big and red, with the reason in words. */
export function Refusal({ title, message, children }: { title: string; message: string; children?: ReactNode }) {
  return (
    <div role="alert" data-testid="station-refusal" className="rounded-card border-2 border-danger-600 bg-danger-50 p-6 text-danger-700">
      <p className="flex items-center gap-3 text-2xl font-semibold">
        <CircleAlert className="h-8 w-8 shrink-0" aria-hidden="true" />
        <span>✕ {title}</span>
      </p>
      <p className="mt-3 text-xl leading-snug">{message}</p>
      {children}
    </div>
  );
}
