"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { actionFailure, actionUser, formValues, type ActionState } from "@/lib/server/action-state";
import { db } from "@/lib/server/db";
import {
  cancelRequest,
  createProject,
  createRequest,
  deleteProject,
  removeProjectFile,
  saveProjectSection,
  updateRequest,
} from "@/lib/server/projects";
import { utapi } from "@/lib/server/uploads/config";
import { systemSections, type SystemSection } from "@/lib/validation/system";
import type { RequestInput } from "@/lib/validation/request";

export type ProjectActionState = ActionState;

export async function startProject(
  _prev: ProjectActionState,
  formData: FormData,
): Promise<ProjectActionState> {
  const user = await actionUser();
  const title = String(formData.get("title") ?? "");
  let id: number;
  try {
    id = await createProject(db(), user, { title });
  } catch (err) {
    return actionFailure(err, { title });
  }
  redirect(`/projects/${id}/edit/site`);
}

/** Save one step; on success the client moves to the next one. */
export async function saveStep(
  projectId: number,
  step: string,
  value: unknown,
): Promise<ProjectActionState> {
  const user = await actionUser();
  if (!(systemSections as readonly string[]).includes(step))
    return { ok: false, message: "Unknown step." };
  try {
    await saveProjectSection(db(), user, projectId, step as SystemSection, value);
  } catch (err) {
    return actionFailure(err);
  }
  revalidatePath(`/projects/${projectId}`);
  return { ok: true, message: "Saved." };
}

export async function postRequest(
  projectId: number,
  _prev: ProjectActionState,
  formData: FormData,
): Promise<ProjectActionState> {
  const user = await actionUser();
  const values = formValues(formData);
  try {
    await createRequest(db(), user, projectId, values as unknown as RequestInput);
  } catch (err) {
    return actionFailure(err, values);
  }
  revalidatePath(`/projects/${projectId}`);
  return { ok: true, message: "Your request is on the board. Verified reviewers can now quote." };
}

export async function withdrawRequest(projectId: number, requestId: number): Promise<void> {
  const user = await actionUser();
  await cancelRequest(db(), user, requestId);
  revalidatePath(`/projects/${projectId}`);
}

export async function deleteFile(projectId: number, attachmentId: number): Promise<void> {
  const user = await actionUser();
  const key = await removeProjectFile(db(), user, attachmentId);
  await utapi().deleteFiles(key);
  revalidatePath(`/projects/${projectId}`);
}

export async function removeProject(projectId: number): Promise<void> {
  const user = await actionUser();
  const keys = await deleteProject(db(), user, projectId);
  if (keys.length) await utapi().deleteFiles(keys);
  redirect("/dashboard");
}

export async function editRequest(
  projectId: number,
  requestId: number,
  _prev: ProjectActionState,
  formData: FormData,
): Promise<ProjectActionState> {
  const user = await actionUser();
  const values = formValues(formData);
  try {
    await updateRequest(db(), user, requestId, values as unknown as RequestInput);
  } catch (err) {
    return actionFailure(err, values);
  }
  revalidatePath(`/projects/${projectId}`);
  return { ok: true, message: "Request updated." };
}
