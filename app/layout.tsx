import type { Metadata } from "next";
import Link from "next/link";
import "./globals.css";
import { ZonePicker } from "@/app/components/ZonePicker";
import { chosenZone } from "@/app/displayZone";
import { AlertBadge } from "@/app/monitors/AlertBadge";

export const metadata: Metadata = {
  title: "Corelag",
  description: "Product core temperature from cold-chain logger traces",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body>
        <header className="site">
          <Link href="/" className="brand">Corelag</Link>
          <nav aria-label="Main">
            <Link href="/">Reviews</Link>
            <Link href="/shipments">Shipments</Link>
            <Link href="/traces">Traces</Link>
            <Link href="/products">Products</Link>
            <Link href="/packs">Packs</Link>
            <Link href="/limits">Limit sets</Link>
            <Link href="/design">Design</Link>
            <Link href="/monitors" data-testid="nav-monitors">Monitors <AlertBadge /></Link>
            <Link href="/loggers">Loggers</Link>
            <Link href="/audit">Audit log</Link>
          </nav>
          <ZonePicker chosen={await chosenZone()} />
        </header>
        <main>{children}</main>
      </body>
    </html>
  );
}
