"use client";

import { Minus, Plus } from "lucide-react";
import { Button } from "@/components/ui/button";
import { cn } from "@/lib/cn";
import type { ContentsItem } from "@/lib/packing/checklist";

export interface LineEntry {
  counted: number | null;
  damaged: number;
}

const MAX_COUNT = 999;

/** A number with big − and + buttons either side, for a gloved hand on a touch screen. */
function Stepper({
  id,
  caption,
  name,
  value,
  onChange,
  disabled,
  invalid,
  compact,
}: {
  id: string;
  caption: string;
  name: string;
  value: number | null;
  onChange: (value: number | null) => void;
  disabled?: boolean;
  invalid?: boolean;
  compact?: boolean;
}) {
  const step = (delta: number) => onChange(Math.min(MAX_COUNT, Math.max(0, (value ?? 0) + delta)));
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-xs font-medium uppercase tracking-wide text-muted">
        {caption}
        <span className="sr-only"> — {name}</span>
      </label>
      <div className="flex items-center gap-1.5">
        <Button
          variant="secondary"
          size="lg"
          className={cn("w-14 px-0", compact && "h-12 w-12")}
          aria-label={`One less: ${caption.toLowerCase()}, ${name}`}
          disabled={disabled || (value ?? 0) <= 0}
          onClick={() => step(-1)}
        >
          <Minus className="h-5 w-5" aria-hidden="true" />
        </Button>
        <input
          id={id}
          inputMode="numeric"
          pattern="[0-9]*"
          autoComplete="off"
          value={value === null ? "" : String(value)}
          placeholder=""
          disabled={disabled}
          aria-invalid={invalid || undefined}
          onChange={(e) => {
            const text = e.target.value.replace(/[^0-9]/g, "").slice(0, 3);
            onChange(text === "" ? null : Number(text));
          }}
          className={cn(
            "h-14 w-16 rounded-lg border-2 border-line-strong bg-surface text-center text-2xl font-semibold tabular-nums text-ink",
            "focus:border-lagoon-600 focus:outline-none focus:ring-4 focus:ring-lagoon-200 aria-[invalid=true]:border-danger-600",
            value === null && "border-dashed bg-paper",
            compact && "h-12 w-14 text-xl",
          )}
        />
        <Button
          variant="secondary"
          size="lg"
          className={cn("w-14 px-0", compact && "h-12 w-12")}
          aria-label={`One more: ${caption.toLowerCase()}, ${name}`}
          disabled={disabled}
          onClick={() => step(1)}
        >
          <Plus className="h-5 w-5" aria-hidden="true" />
        </Button>
      </div>
    </div>
  );
}

function lineStatus(item: ContentsItem, entry: LineEntry): { text: string; tone: "muted" | "ok" | "warn" | "danger" } {
  if (entry.counted === null) return { text: "Not counted", tone: "muted" };
  if (entry.counted > item.quantity) return { text: `${entry.counted - item.quantity} too many`, tone: "danger" };
  if (entry.damaged > entry.counted) return { text: "More damaged than counted", tone: "danger" };
  const parts: string[] = [];
  if (entry.counted < item.quantity) parts.push(`${item.quantity - entry.counted} missing`);
  if (entry.damaged > 0) parts.push(`${entry.damaged} damaged`);
  return parts.length ? { text: parts.join(", "), tone: "warn" } : { text: "✓ As listed", tone: "ok" };
}

const TONE = {
  muted: "text-muted",
  ok: "text-ok-700",
  warn: "text-warn-700 font-semibold",
  danger: "text-danger-700 font-semibold",
} as const;

/**
 * The contents list to count: every line starts blank, so each one has to be confirmed; the
 * damaged count of a line is counted among its instruments.
 */
export function ContentsChecklist({
  items,
  entries,
  onChange,
  errors,
  disabled,
}: {
  items: ContentsItem[];
  entries: Record<number, LineEntry>;
  onChange: (position: number, entry: LineEntry) => void;
  errors: Record<number, string[]>;
  disabled?: boolean;
}) {
  return (
    <ol className="divide-y divide-line" data-testid="contents-checklist">
      {items.map((item) => {
        const entry = entries[item.position] ?? { counted: null, damaged: 0 };
        const status = lineStatus(item, entry);
        const lineErrors = errors[item.position] ?? [];
        return (
          <li
            key={item.position}
            data-testid="checklist-line"
            data-line={item.name}
            className={cn("space-y-2 px-2 py-4", lineErrors.length > 0 && "rounded-lg bg-danger-50")}
          >
            <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1">
              <p className="min-w-0 text-lg font-medium leading-snug text-ink">{item.name}</p>
              <p className="text-sm text-muted">
                Listed: <span className="font-semibold tabular-nums text-ink">{item.quantity}</span>
                <span className={cn("ml-3", TONE[status.tone])} data-testid="line-status">
                  {status.text}
                </span>
              </p>
            </div>
            {lineErrors.map((message) => (
              <p key={message} role="alert" className="text-sm font-medium text-danger-700">
                {message}
              </p>
            ))}
            <div className="flex flex-wrap items-end gap-x-6 gap-y-3">
              <Stepper
                id={`count-${item.position}`}
                caption="Counted"
                name={item.name}
                value={entry.counted}
                disabled={disabled}
                invalid={lineErrors.length > 0}
                onChange={(counted) => onChange(item.position, { ...entry, counted })}
              />
              <Stepper
                id={`damaged-${item.position}`}
                caption="Damaged"
                name={item.name}
                value={entry.damaged}
                disabled={disabled}
                compact
                onChange={(damaged) => onChange(item.position, { ...entry, damaged: damaged ?? 0 })}
              />
            </div>
          </li>
        );
      })}
    </ol>
  );
}
