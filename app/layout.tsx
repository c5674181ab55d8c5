import type { Metadata } from "next";
import Link from "next/link";
import "./globals.css";
import { ZonePicker } from "@/app/components/ZonePicker";
import { chosenZone } from "@/app/displayZone";
import { AlertBadge } from "@/app/monitors/AlertBadge";
import { headers } from "next/headers";
import { actorFromRequest } from "@/lib/services/access";
import { userById } from "@/lib/db/users";
import { UserMenu } from "@/app/components/UserMenu";

export const metadata: Metadata = {
  title: "Corelag",
  description: "Product core temperature from cold-chain logger traces",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // The sign-in and first-administrator pages render without a user: the header then shows no navigation.
  const actor = await actorFromRequest(await headers());
  const demo = actor?.kind === "user" ? ((await userById(actor.userId))?.demo ?? false) : false;
  return (
    <html lang="en">
      <body>
        <header className="site">
          <Link href="/" className="brand">Corelag</Link>
          {actor && <nav aria-label="Main">
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
            <Link href="/api-docs">API</Link>
          </nav>}
          <ZonePicker chosen={await chosenZone()} />
          {actor && <UserMenu actor={actor} demo={demo} />}
        </header>
        <main>{children}</main>
      </body>
    </html>
  );
}
