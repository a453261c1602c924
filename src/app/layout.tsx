import type { Metadata } from "next";
import "./globals.css";
import { figuresFont, textFont } from "./fonts";

export const metadata: Metadata = {
  title: { default: "Cairn", template: "%s · Cairn" },
  description: "Protocol versions, site adoption, visits and site payments for multi-center device investigations.",
  icons: { icon: "/favicon.svg" },
  robots: { index: false, follow: false },
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${textFont.variable} ${figuresFont.variable}`}>
      <body className="min-h-screen">{children}</body>
    </html>
  );
}
