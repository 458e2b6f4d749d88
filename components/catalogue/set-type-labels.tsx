import { Badge } from "@/components/ui/badge";
import { expectsIfu } from "@/lib/catalogue/vocabulary";

/** The badges beside a set type's name: out of use, loaner without its IFU. */
export function SetTypeBadges({ setClass, hasIfu, active }: { setClass: string; hasIfu: boolean; active: boolean }) {
  return (
    <>
      {!active && <Badge tone="neutral">Inactive</Badge>}
      {expectsIfu(setClass) && !hasIfu && <Badge tone="warn">No IFU</Badge>}
      {expectsIfu(setClass) && hasIfu && <Badge tone="info">Loaner</Badge>}
    </>
  );
}
