import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
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
  title: {
    default: "Loopwright — solar hot-water loop checks and expert reviews",
    template: "%s · Loopwright",
  },
  description:
    "Check a pumped solar water-heating loop before it is filled, and buy a design review or site visit from a verified solar-competent plumber.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page is rendered per request, so Next.js can put this request's CSP nonce (set in
  // proxy.ts) on its scripts; a prerendered page would carry none and never hydrate.
  await connection();
  return (
    <html lang="en-GB" className={inter.variable}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
