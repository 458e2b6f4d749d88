"use client";

import { ScanLine } from "lucide-react";
import { type FormEvent, useEffect, useRef, useState } from "react";
import { Button } from "@/components/ui/button";

/**
 * The scan field of a station: a keyboard-wedge scanner types the code and presses Enter. The
 * field keeps the focus after every scan so the next one needs no mouse; typing a serial by hand
 * works the same way.
 */
export function ScanField({
  onScan,
  busy,
  label = "Scan a set",
  placeholder = "Scan the label, or type the serial and press Enter",
}: {
  onScan: (code: string) => void | Promise<void>;
  busy?: boolean;
  label?: string;
  placeholder?: string;
}) {
  const [value, setValue] = useState("");
  const ref = useRef<HTMLInputElement>(null);
  useEffect(() => {
    ref.current?.focus();
  }, [busy]);
  const submit = async (event: FormEvent) => {
    event.preventDefault();
    const code = value.trim();
    if (!code) return;
    setValue("");
    await onScan(code);
    ref.current?.focus();
  };
  return (
    <form onSubmit={submit} className="flex gap-3" role="search">
      <label htmlFor="station-scan" className="sr-only">
        {label}
      </label>
      <input
        id="station-scan"
        ref={ref}
        value={value}
        onChange={(e) => setValue(e.target.value)}
        autoComplete="off"
        autoCapitalize="off"
        spellCheck={false}
        placeholder={placeholder}
        className="h-16 min-w-0 flex-1 rounded-xl border-2 border-lagoon-600 bg-surface px-5 text-lg text-ink placeholder:text-muted focus:outline-none focus:ring-4 focus:ring-lagoon-200"
      />
      <Button type="submit" size="lg" className="h-16 shrink-0 px-5 sm:px-8" disabled={busy}>
        <ScanLine className="h-6 w-6" aria-hidden="true" />
        <span className="sr-only sm:not-sr-only">{busy ? "Reading…" : label}</span>
      </Button>
    </form>
  );
}
