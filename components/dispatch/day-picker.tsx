"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { Input } from "@/components/ui/input";

/** Previous and next day, and a date field to jump to any day. */
export function DayPicker({ day, previous, next, base }: { day: string; previous: string; next: string; base: string }) {
  const router = useRouter();
  return (
    <div className="flex items-center gap-2 text-sm">
      <Link href={`${base}/${previous}`} className="rounded-lg border border-line-strong bg-surface px-3 py-2 hover:bg-paper">
        ← Previous day
      </Link>
      <label className="sr-only" htmlFor="plan-day">
        Day
      </label>
      <Input id="plan-day" type="date" className="w-44" value={day} onChange={(e) => e.target.value && router.push(`${base}/${e.target.value}`)} />
      <Link href={`${base}/${next}`} className="rounded-lg border border-line-strong bg-surface px-3 py-2 hover:bg-paper">
        Next day →
      </Link>
    </div>
  );
}
