import type { Metadata, Viewport } from "next";
import { connection } from "next/server";
import type { ReactNode } from "react";
import { Providers } from "@/components/providers";
import { plexSans } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Steamlane", template: "%s · Steamlane" },
  description: "Instrument reprocessing between Larkmoor Sterile Services and the clinics it serves.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0f5e63" };

export default async function RootLayout({ children }: { children: ReactNode }) {
  // Every page renders per request: its scripts carry the request's CSP nonce (proxy.ts), which a
  // page rendered once at build time could not.
  await connection();
  return (
    <html lang="en-GB" className={plexSans.variable}>
      <body className="min-h-screen font-sans">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
