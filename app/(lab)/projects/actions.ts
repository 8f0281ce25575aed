'use server';

import { revalidatePath } from 'next/cache';
import { redirect } from 'next/navigation';
import { z } from 'zod';
import { createProject, deleteProject, updateProject } from '@/db/queries/projects';
import { formAction } from '@/lib/server/auth/action';
import { notFound } from '@/lib/errors';
import { uuidSchema } from '@/lib/schemas/common';
import { projectCreateSchema, projectRenameSchema } from '@/lib/schemas/project';

export const createProjectAction = formAction('project.write', projectCreateSchema, async (actor, input) => {
  const project = await createProject(actor.labId, actor.user.id, input);
  revalidatePath('/projects');
  return `Created “${project.name}”`;
});

export const renameProjectAction = formAction('project.write', projectRenameSchema.extend({ id: uuidSchema }), async (actor, input) => {
  const project = await updateProject(actor.labId, actor.user.id, input.id, { name: input.name });
  if (!project) throw notFound('No such project');
  revalidatePath('/projects');
  revalidatePath(`/projects/${input.id}`);
  return 'Renamed';
});

export const deleteProjectAction = formAction('project.delete', z.object({ id: uuidSchema }), async (actor, input) => {
  const ok = await deleteProject(actor.labId, actor.user.id, input.id);
  if (!ok) throw notFound('No such project');
  revalidatePath('/projects');
  redirect('/projects');
});
