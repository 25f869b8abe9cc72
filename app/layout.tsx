import type { Metadata, Viewport } from "next";
import { Announcer } from "@/components/ui/announcer";
import { inter } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Blockyard", template: "%s · Blockyard" },
  description: "Foam block stock, defect maps and cut planning for hot-wire shops.",
  icons: { icon: "/icon.svg" },
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#1c2a2e" };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body>
        <Announcer>{children}</Announcer>
      </body>
    </html>
  );
}
