import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
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

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en-GB" className={inter.variable}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
