"use client";

import { usePathname, useRouter } from "next/navigation";
import { Field } from "@/components/ui/field";
import { Select } from "@/components/ui/input";

export interface CustomerChoice {
  id: number;
  name: string;
  setTypeCount: number;
}

/** The customer whose catalogue the page shows; the choice lives in the address (?organisation=). */
export function CustomerPicker({ customers, selectedId, id = "catalogue-customer" }: { customers: CustomerChoice[]; selectedId: number; id?: string }) {
  const router = useRouter();
  const pathname = usePathname();
  return (
    <Field id={id} label="Customer" className="max-w-md">
      <Select id={id} value={selectedId} onChange={(e) => router.push(`${pathname}?organisation=${e.target.value}`)}>
        {customers.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name} ({c.setTypeCount} set types)
          </option>
        ))}
      </Select>
    </Field>
  );
}
