import { randomUUID } from "node:crypto";
import { db } from "./client";
import { appendAudit } from "./audit";
import { canonicalJson } from "../review/canonical";
import { sha256Hex } from "../trace/hash";
import { definitionContentHash } from "../review/content";
import type { Actor } from "../access/actor";

export type DefinitionKind = "product" | "pack" | "limits" | "profile";

export interface StoredDefinition<T = unknown> {
  id: string;
  kind: DefinitionKind;
  lineage: string;
  version: number;
  name: string;
  body: T;
  sha256: string;
  createdAt: Date;
}

function toStored<T>(row: { id: string; kind: string; lineage: string; version: number; name: string; body: unknown; sha256: string; createdAt: Date }): StoredDefinition<T> {
  return { ...row, kind: row.kind as DefinitionKind, body: row.body as T };
}

type Tx = Parameters<Parameters<typeof db.$transaction>[0]>[0];

/**
 * Inserts one definition version with its body as the exact JSON text JSON.stringify gives. Prisma 6.19's
 * Json write path re-parses numbers without correct rounding (0.1 + 0.2 is stored as 0.3, a fitted
 * 0.0069124423963133645 loses its last digit), so the stored body would no longer hash to the SHA-256
 * computed from the validated body, and verify would report a definition nobody changed. Reading back
 * through Prisma is exact. (A second database needs its JSON cast here, e.g. `::jsonb` on PostgreSQL.)
 */
async function insertDefinition(tx: Tx, d: { kind: string; lineage: string; version: number; name: string; body: unknown }) {
  const id = randomUUID().replace(/-/g, "");
  const sha256 = sha256Hex(canonicalJson(d.body));
  await tx.$executeRaw`INSERT INTO "Definition" ("id", "kind", "lineage", "version", "name", "body", "sha256", "createdAt") VALUES (${id}, ${d.kind}, ${d.lineage}, ${d.version}, ${d.name}, ${JSON.stringify(d.body)}, ${sha256}, ${new Date()})`;
  return tx.definition.findUniqueOrThrow({ where: { id } });
}

/** A new definition, version 1 of a new lineage. `body` must already be validated. */
export async function createDefinition<T extends { name: string }>(kind: DefinitionKind, body: T, actor: Actor): Promise<StoredDefinition<T>> {
  return db.$transaction(async (tx) => {
    const row = await insertDefinition(tx, { kind, lineage: randomUUID(), version: 1, name: body.name, body });
    await appendAudit(tx, { action: "create", entity: "definition", entityId: row.id, actor, details: { kind, name: row.name, lineage: row.lineage, version: 1, sha256: row.sha256 }, contentSha256: definitionContentHash(row) });
    return toStored<T>(row);
  });
}

/** An edit: a new version in the same lineage. Earlier versions stay as they were, for the reviews that used them. */
export async function reviseDefinition<T extends { name: string }>(lineage: string, body: T, actor: Actor): Promise<StoredDefinition<T>> {
  return db.$transaction(async (tx) => {
    const latest = await tx.definition.findFirst({ where: { lineage }, orderBy: { version: "desc" } });
    if (!latest) throw new Error(`no definition with lineage ${lineage}`);
    const row = await insertDefinition(tx, { kind: latest.kind, lineage, version: latest.version + 1, name: body.name, body });
    await appendAudit(tx, {
      action: "edit",
      entity: "definition",
      entityId: row.id,
      actor,
      details: { kind: row.kind, name: row.name, lineage, version: row.version, previous: latest.id, sha256: row.sha256 },
      contentSha256: definitionContentHash(row),
    });
    return toStored<T>(row);
  });
}

export async function getDefinition<T>(id: string): Promise<StoredDefinition<T> | null> {
  const row = await db.definition.findUnique({ where: { id } });
  return row ? toStored<T>(row) : null;
}

/** The latest version of every lineage of one kind, newest first. */
export async function listLatestDefinitions<T>(kind: DefinitionKind): Promise<StoredDefinition<T>[]> {
  const rows = await db.definition.findMany({ where: { kind }, orderBy: [{ lineage: "asc" }, { version: "desc" }] });
  const latest = new Map<string, (typeof rows)[number]>();
  for (const r of rows) if (!latest.has(r.lineage)) latest.set(r.lineage, r);
  return [...latest.values()].sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime()).map((r) => toStored<T>(r));
}

/** Every version of one lineage, oldest first (identity only, no bodies). */
export async function definitionVersions(lineage: string): Promise<Array<{ id: string; version: number; name: string; sha256: string; createdAt: Date }>> {
  return db.definition.findMany({ where: { lineage }, select: { id: true, version: true, name: true, sha256: true, createdAt: true }, orderBy: { version: "asc" } });
}
