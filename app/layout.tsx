import type { Metadata, Viewport } from "next";
import type { ReactNode } from "react";
import { Providers } from "@/components/providers";
import { plexSans } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Steamlane", template: "%s · Steamlane" },
  description: "Instrument reprocessing between Larkmoor Sterile Services and the clinics it serves.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0f5e63" };

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en-GB" className={plexSans.variable}>
      <body className="min-h-screen font-sans">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
