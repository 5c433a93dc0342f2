/**
 * Photo guidance on the project page, and which checklist items each of the homeowner's photos
 * shows (attachment_items). The items are the checklist for the project's description as it is
 * now, plus those of the request already posted (its snapshot), so a photo can be tagged to
 * anything the reviewer will see.
 */
import { runLoopCheck } from "@/lib/calc/loop-check";
import { buildChecklist } from "@/lib/checklist/build";
import { CATALOGUE } from "@/lib/checklist/catalogue";
import { itemTitle } from "@/lib/checklist/item-titles";
import { photoGuidanceFor } from "@/lib/checklist/photo-guidance";
import { photoItemsSchema } from "@/lib/validation/review";
import { systemSchema } from "@/lib/validation/system";
import type { PhotoGuidanceItem, PhotoGuidanceView } from "@/lib/types/aftercare";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { forbidden, notFound, parseInput, unprocessable } from "./errors";
import { parseJson } from "./json";

async function projectRow(db: Db, actor: Actor, projectId: number) {
  const row = await db("projects")
    .where({ id: projectId })
    .whereNull("deleted_at")
    .first("id", "owner_id", "system");
  if (!row || (Number(row.owner_id) !== actor.id && actor.role !== "admin"))
    throw notFound("No such project.");
  return row;
}

/** The catalogue keys that apply to the project, in catalogue order. */
async function applicableKeys(
  db: Db,
  projectId: number,
  systemJson: unknown,
): Promise<{ ready: boolean; keys: string[] }> {
  const keys = new Set<string>();
  const parsed = systemSchema.safeParse(parseJson(systemJson as string));
  if (parsed.success) {
    const check = runLoopCheck(parsed.data);
    for (const i of buildChecklist(parsed.data, check.findings).items) keys.add(i.key);
  }
  const snapshots = await db("requests")
    .where({ project_id: projectId })
    .whereNotNull("loop_check_snapshot")
    .select("loop_check_snapshot");
  for (const s of snapshots) {
    const snap = parseJson<{ itemKeys?: string[] }>(s.loop_check_snapshot);
    for (const k of snap?.itemKeys ?? []) keys.add(k);
  }
  const order = CATALOGUE.map((i) => i.key);
  const sorted = [...keys].sort((a, b) => {
    const ia = order.indexOf(a);
    const ib = order.indexOf(b);
    return (ia < 0 ? 1e9 : ia) - (ib < 0 ? 1e9 : ib);
  });
  return { ready: parsed.success || sorted.length > 0, keys: sorted };
}

/** The guidance for the project page: the items that need a photo, the photos and their tags. */
export async function getPhotoGuidance(
  db: Db,
  actor: Actor,
  projectId: number,
): Promise<PhotoGuidanceView> {
  const project = await projectRow(db, actor, projectId);
  const { ready, keys } = await applicableKeys(db, projectId, project.system);
  const photos = await db("attachments")
    .where({ project_id: projectId, purpose: "photo" })
    .whereNull("deleted_at")
    .orderBy("id")
    .select("id", "file_name", "caption");
  const tags = photos.length
    ? await db("attachment_items")
        .whereIn(
          "attachment_id",
          photos.map((p) => p.id),
        )
        .select("attachment_id", "item_key")
    : [];
  const byPhoto = new Map<number, string[]>();
  for (const t of tags) {
    const id = Number(t.attachment_id);
    byPhoto.set(id, [...(byPhoto.get(id) ?? []), String(t.item_key)]);
  }
  const section = new Map(CATALOGUE.map((i) => [i.key, i.section as string]));
  const catalogueItem = new Map(CATALOGUE.map((i) => [i.key, i]));
  const items: PhotoGuidanceItem[] = [];
  for (const key of keys) {
    const g = photoGuidanceFor(key);
    const photo = g?.photo ?? catalogueItem.get(key)?.photo;
    if (!photo) continue;
    items.push({
      key,
      title: itemTitle(key),
      section: section.get(key) ?? "",
      photo,
      fromRoof: Boolean(g?.fromRoof),
      photoIds: photos
        .filter((p) => (byPhoto.get(Number(p.id)) ?? []).includes(key))
        .map((p) => Number(p.id)),
    });
  }
  return {
    ready,
    items,
    taggable: keys.map((key) => ({ key, title: itemTitle(key) })),
    photos: photos.map((p) => ({
      id: Number(p.id),
      fileName: p.file_name,
      caption: p.caption,
      itemKeys: (byPhoto.get(Number(p.id)) ?? []).filter((k) => keys.includes(k)),
    })),
  };
}

/**
 * Say which checklist items one of the homeowner's photos shows (replacing what was said
 * before). The photo must be theirs, on this project; each item must apply to the project.
 */
export async function setPhotoItems(
  db: Db,
  actor: Actor,
  projectId: number,
  attachmentId: number,
  input: unknown,
): Promise<string[]> {
  if (actor.role !== "homeowner") throw forbidden("Only the project's owner tags its photos.");
  const v = parseInput(photoItemsSchema, input);
  return db.transaction(async (trx) => {
    const project = await trx("projects")
      .where({ id: projectId, owner_id: actor.id })
      .whereNull("deleted_at")
      .forUpdate()
      .first("id", "system");
    if (!project) throw notFound("No such project.");
    const photo = await trx("attachments")
      .where({ id: attachmentId, owner_id: actor.id, project_id: projectId })
      .whereNull("deleted_at")
      .first("id", "purpose");
    if (!photo) throw notFound("No such photo on this project.");
    if (photo.purpose !== "photo")
      throw unprocessable("Only photos are tagged to checklist items.", {
        attachmentId: ["Choose one of the project's photos"],
      });
    const { keys } = await applicableKeys(trx, projectId, project.system);
    const wanted = [...new Set(v.itemKeys)];
    const unknown = wanted.filter((k) => !keys.includes(k));
    if (unknown.length)
      throw unprocessable("Some of those checks do not apply to this project.", {
        itemKeys: unknown.map((k) => `“${itemTitle(k)}” does not apply to this project`),
      });
    await trx("attachment_items").where({ attachment_id: attachmentId }).del();
    if (wanted.length)
      await trx("attachment_items").insert(
        wanted.map((k) => ({ attachment_id: attachmentId, item_key: k })),
      );
    await audit(trx, actor.id, "photo.items_tagged", "attachment", attachmentId, {
      projectId,
      itemKeys: wanted,
    });
    return wanted;
  });
}
