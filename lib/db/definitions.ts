import { randomUUID } from "node:crypto";
import { db } from "./client";
import { appendAudit } from "./audit";
import { canonicalJson } from "../review/canonical";
import { sha256Hex } from "../trace/hash";
import { definitionContentHash } from "../review/content";

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

/** A new definition, version 1 of a new lineage. `body` must already be validated. */
export async function createDefinition<T extends { name: string }>(kind: DefinitionKind, body: T, actor = "web"): Promise<StoredDefinition<T>> {
  return db.$transaction(async (tx) => {
    const row = await tx.definition.create({
      data: { kind, lineage: randomUUID(), version: 1, name: body.name, body: body as object, sha256: sha256Hex(canonicalJson(body)) },
    });
    await appendAudit(tx, { action: "create", entity: "definition", entityId: row.id, actor, details: { kind, name: row.name, lineage: row.lineage, version: 1, sha256: row.sha256 }, contentSha256: definitionContentHash(row) });
    return toStored<T>(row);
  });
}

/** An edit: a new version in the same lineage. Earlier versions stay as they were, for the reviews that used them. */
export async function reviseDefinition<T extends { name: string }>(lineage: string, body: T, actor = "web"): Promise<StoredDefinition<T>> {
  return db.$transaction(async (tx) => {
    const latest = await tx.definition.findFirst({ where: { lineage }, orderBy: { version: "desc" } });
    if (!latest) throw new Error(`no definition with lineage ${lineage}`);
    const row = await tx.definition.create({
      data: { kind: latest.kind, lineage, version: latest.version + 1, name: body.name, body: body as object, sha256: sha256Hex(canonicalJson(body)) },
    });
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
