import type { Metadata, Viewport } from "next";
import { headers } from "next/headers";
import type { ReactNode } from "react";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Rimelog", template: "%s · Rimelog" },
  description: "Offline-first logbook for the cryostat room",
  manifest: "/manifest.webmanifest",
  icons: { icon: "/icons/icon.svg" },
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0b5cad" };

// Applied before first paint so the dim theme never flashes white in a darkened lab.
const themeBoot = `try{var t=localStorage.getItem("rimelog-theme");if(t==="dim")document.documentElement.dataset.theme="dim"}catch(e){}`;

// Pages render per request: the Content-Security-Policy's script nonce (set by proxy.ts) is new
// each time, and Next puts it on its own scripts; this one inline script carries it too.
export default async function RootLayout({ children }: { children: ReactNode }) {
  const nonce = (await headers()).get("x-nonce") ?? undefined;
  return (
    <html lang="en-GB" suppressHydrationWarning>
      <head>
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: themeBoot }} />
      </head>
      <body className="min-h-screen antialiased">{children}</body>
    </html>
  );
}
