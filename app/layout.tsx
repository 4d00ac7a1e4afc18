import type { Metadata, Viewport } from "next";
import { headers } from "next/headers";
import type { ReactNode } from "react";
import { inter, jetbrains } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Pinchpoint", template: "%s · Pinchpoint" },
  description: "Where your service estate pinches: dependency inventory, single points of failure, blast radius.",
  icons: { icon: "/favicon.svg" },
};

export const viewport: Viewport = { colorScheme: "dark light" };

// Runs before paint so the theme does not flash: the user's stored choice, else the operating system's preference.
const themeScript = `try{var t=localStorage.getItem("pp-theme");if(t!=="light"&&t!=="dark")t=window.matchMedia&&window.matchMedia("(prefers-color-scheme: light)").matches?"light":"dark";document.documentElement.dataset.theme=t}catch(e){}`;

export default async function RootLayout({ children }: { children: ReactNode }) {
  // The page's Content-Security-Policy allows only scripts with this request's nonce (proxy.ts).
  const nonce = (await headers()).get("x-nonce") ?? undefined;
  return (
    <html lang="en" data-theme="dark" className={`${inter.variable} ${jetbrains.variable}`} suppressHydrationWarning>
      <head>
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: themeScript }} />
      </head>
      <body className="min-h-screen bg-canvas font-sans text-ink antialiased">{children}</body>
    </html>
  );
}
