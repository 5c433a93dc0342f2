import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { env } from "@/lib/env";
import "./globals.css";

// Shipped with the app from the @fontsource-variable/inter npm package: nothing is fetched at run time.
const inter = localFont({
  src: [
    {
      path: "../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2",
      weight: "100 900",
    },
  ],
  variable: "--font-inter",
  display: "swap",
});

export const metadata: Metadata = {
  metadataBase: new URL(env().APP_URL),
  title: {
    default: "Loopwright — solar hot-water loop checks, remote design checks and site visits",
    template: "%s · Loopwright",
  },
  description:
    "Check a pumped solar water-heating loop before it is filled, and buy a remote design check or a site visit from a verified solar-competent plumber.",
  // The app's own icon, manifest and social preview, served from public/.
  icons: { icon: "/icon.svg", apple: "/apple-icon.png" },
  manifest: "/manifest.webmanifest",
  openGraph: {
    title: "Loopwright",
    description: "Get your solar loop checked before it is filled.",
    images: [{ url: "/social.png", width: 1200, height: 630, alt: "Loopwright" }],
  },
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

/**
 * Pages are rendered per request (they read the session, the database or the address), so
 * Next.js can put the request's CSP nonce (proxy.ts) on their scripts. The few that hold
 * nothing per request are prerendered once, and proxy.ts gives them the policy without a nonce:
 * see STATIC_PAGES in lib/security-headers.ts.
 */
export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en-GB" className={inter.variable}>
      <body className="flex min-h-screen flex-col font-sans">{children}</body>
    </html>
  );
}
