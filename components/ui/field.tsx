import * as LabelPrimitive from "@radix-ui/react-label";
import type { ReactNode } from "react";
import { cn } from "@/lib/cn";

/** A labelled form field with its hint and its error under it. */
export function Field({
  id,
  label,
  hint,
  error,
  children,
  className,
}: {
  id: string;
  label: string;
  hint?: string;
  error?: string;
  children: ReactNode;
  className?: string;
}) {
  return (
    <div className={cn("space-y-1.5", className)}>
      <LabelPrimitive.Root htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </LabelPrimitive.Root>
      {children}
      {hint && !error && (
        <p id={`${id}-hint`} className="text-xs text-muted">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-error`} role="alert" className="text-xs font-medium text-danger-700">
          {error}
        </p>
      )}
    </div>
  );
}
