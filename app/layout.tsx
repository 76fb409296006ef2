import "@fontsource-variable/inter";
import "./globals.css";

import type { Metadata } from "next";

export const metadata: Metadata = {
  title: { default: "Heliotally", template: "%s · Heliotally" },
  description:
    "Log daily sunspot counts, review a network's submissions and publish its relative-number series.",
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
