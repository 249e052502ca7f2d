import type { NextConfig } from "next";
import { DOWNLOAD_CONTENT_SECURITY_POLICY } from "./lib/http/csp";

const nextConfig: NextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  serverExternalPackages: [
    "@libsql/client",
    "libsql",
    "smtp-server",
    "mailparser",
    "bcryptjs",
    "@resvg/resvg-js",
    "pdfkit",
    "svg-to-pdfkit",
    "vega",
    "vega-lite",
    "vega-interpreter",
    "sharp",
    "exceljs",
  ],
  typedRoutes: false,
  async redirects() {
    // The manuscript's figure status page used to live at …/board; old links and bookmarks still land on it.
    return [{ source: "/manuscripts/:id/board", destination: "/manuscripts/:id/status", permanent: true }];
  },
  async headers() {
    return [
      {
        source: "/:path*",
        headers: [
          { key: "X-Content-Type-Options", value: "nosniff" },
          // same-origin, not no-referrer: with no-referrer a browser sends `Origin: null` on our own POSTs.
          { key: "Referrer-Policy", value: "same-origin" },
          { key: "X-Frame-Options", value: "DENY" },
          { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
          { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
        ],
      },
      // Pages get a nonce policy from proxy.ts; API answers and downloads get one that runs nothing.
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: DOWNLOAD_CONTENT_SECURITY_POLICY }] },
    ];
  },
};

export default nextConfig;
