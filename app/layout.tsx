import type { Metadata, Viewport } from "next";
import type { ReactNode } from "react";
import { inter } from "./fonts";
import { Providers } from "./providers";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Platewright", template: "%s · Platewright" },
  description: "Plan and run 3D-print work for multi-part assemblies in a shared workshop.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
