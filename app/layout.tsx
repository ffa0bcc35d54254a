import type { Metadata } from "next";
import type { ReactNode } from "react";
import { sans, mono } from "./fonts";
import { Providers } from "./providers";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Lapbench", template: "%s · Lapbench" },
  description: "Logger data to laps, overlays and findings for road-racing motorcycle teams.",
  icons: { icon: "/icon.svg" },
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen antialiased">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
