import { NextResponse } from 'next/server';
import { createProject, listProjects } from '@/db/queries/projects';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { projectCreateSchema } from '@/lib/schemas/project';

export const GET = withAuth(async (_req, { actor }) => NextResponse.json({ projects: await listProjects(actor.labId) }), { permission: 'project.read' });

export const POST = withAuth(
  async (req, { actor }) => {
    const input = projectCreateSchema.parse(await readJson(req));
    const project = await createProject(actor.labId, actor.user.id, input);
    return NextResponse.json({ project }, { status: 201 });
  },
  { permission: 'project.write' },
);
