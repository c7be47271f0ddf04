import type { Metadata } from "next";
import type { ReactNode } from "react";
import { ToastProvider } from "@/components/ui/toast";
import { halflightMono, halflightSans } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Halflight", template: "%s · Halflight" },
  description: "UV-Vis absorbance kinetics: ingest, fit, compare, review.",
  icons: { icon: { url: "/icon.svg", type: "image/svg+xml" } },
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`${halflightSans.variable} ${halflightMono.variable}`}>
      <body className="min-h-screen">
        <ToastProvider>{children}</ToastProvider>
      </body>
    </html>
  );
}
