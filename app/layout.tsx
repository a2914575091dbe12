import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
import type { ReactNode } from "react";
import { ZodWithoutEval } from "@/components/security/ZodWithoutEval";
import "./globals.css";

const inter = localFont({
  src: "../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2",
  weight: "100 900",
  style: "normal",
  display: "swap",
  variable: "--font-inter",
});

export const metadata: Metadata = {
  title: { default: "Cloche", template: "%s · Cloche" },
  description: "Keeps heated glasshouses and polytunnels at the right temperature for the least money.",
  applicationName: "Cloche",
};

export const viewport: Viewport = {
  themeColor: "#34562c",
};

// Every page is rendered per request: its inline scripts must carry that response's CSP
// nonce (proxy.ts), which a page prerendered at build time could not.
export default async function RootLayout({ children }: { children: ReactNode }) {
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-dvh font-sans">
        <ZodWithoutEval />
        {children}
      </body>
    </html>
  );
}
