"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";
import { idSchema } from "@/lib/data/errors";
import {
  cancelRequest,
  createProject,
  createRequest,
  deleteProject,
  removeProjectFile,
  saveProjectSection,
  updateRequest,
} from "@/lib/data/projects";
import { utapi } from "@/lib/server/uploads/config";
import { systemSections } from "@/lib/validation/system";

export type ProjectActionState = ActionState;

const projectIds = z.object({ projectId: idSchema });
const requestIds = z.object({ projectId: idSchema, requestId: idSchema });

export async function startProject(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: z.object({}),
    input: {},
    values,
    run: (actor) => createProject(db(), actor, values),
    done: "Project created.",
    after: (id) => redirect(`/projects/${id}/edit/site`),
  });
}

/** One step of the description, sent by the step form as the section's values. */
export async function saveStep(
  projectId: number,
  step: string,
  value: unknown,
): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: z.object({ projectId: idSchema, step: z.enum(systemSections) }),
    input: { projectId, step },
    run: (actor, ids) => saveProjectSection(db(), actor, ids.projectId, ids.step, value),
    done: "Saved.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

export async function postRequest(
  projectId: number,
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: projectIds,
    input: { projectId },
    values,
    run: (actor, ids) => createRequest(db(), actor, ids.projectId, values),
    done: "Your request is on the board. Verified reviewers can now quote.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

export async function editRequest(
  projectId: number,
  requestId: number,
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: requestIds,
    input: { projectId, requestId },
    values,
    run: (actor, ids) => updateRequest(db(), actor, ids.requestId, values),
    done: "Request updated.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

export async function withdrawRequest(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: requestIds,
    input: formValues(formData),
    run: (actor, ids) => cancelRequest(db(), actor, ids.requestId),
    done: "Request cancelled.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

export async function deleteFile(_prev: ActionState, formData: FormData): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: z.object({ projectId: idSchema, attachmentId: idSchema }),
    input: formValues(formData),
    run: async (actor, ids) => {
      const key = await removeProjectFile(db(), actor, ids.attachmentId);
      await utapi().deleteFiles(key);
    },
    done: "File deleted.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

export async function removeProject(_prev: ActionState, formData: FormData): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: projectIds,
    input: formValues(formData),
    run: async (actor, ids) => {
      const keys = await deleteProject(db(), actor, ids.projectId);
      if (keys.length) await utapi().deleteFiles(keys);
    },
    done: "Project deleted.",
    after: () => redirect("/dashboard"),
  });
}
