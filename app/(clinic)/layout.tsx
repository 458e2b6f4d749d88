import type { ReactNode } from "react";
import { AudienceLayout } from "@/components/shell/audience-layout";

export default function Layout({ children }: { children: ReactNode }) {
  return <AudienceLayout audience="clinic">{children}</AudienceLayout>;
}
