import type { ReactNode } from "react";
import { cn } from "@/lib/cn";

// Status badges carry a symbol as well as a colour, so they read without colour vision.
const tones = {
  neutral: { className: "bg-paper text-ink-soft border-line-strong", mark: "○" },
  info: { className: "bg-lagoon-50 text-lagoon-800 border-lagoon-200", mark: "◆" },
  ok: { className: "bg-ok-50 text-ok-700 border-ok-600/30", mark: "✓" },
  warn: { className: "bg-warn-50 text-warn-700 border-warn-600/30", mark: "!" },
  danger: { className: "bg-danger-50 text-danger-700 border-danger-600/30", mark: "✕" },
} as const;

export type BadgeTone = keyof typeof tones;

export function Badge({ tone = "neutral", children }: { tone?: BadgeTone; children: ReactNode }) {
  const t = tones[tone];
  return (
    <span className={cn("inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-medium", t.className)}>
      <span aria-hidden="true">{t.mark}</span>
      {children}
    </span>
  );
}
