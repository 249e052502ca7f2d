import type { Metadata } from "next";
import type { ReactNode } from "react";
import { inter } from "./_fonts/inter";
import "./globals.css";

// Every page carries a per-request CSP nonce (proxy.ts), so no page may be prerendered.
export const dynamic = "force-dynamic";

export const metadata: Metadata = {
  title: { default: "Prooflight", template: "%s · Prooflight" },
  description: "Publication figures every co-author can check, traced to the bytes that were measured.",
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans antialiased">{children}</body>
    </html>
  );
}
