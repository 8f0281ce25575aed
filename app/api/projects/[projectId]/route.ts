import { NextResponse } from 'next/server';
import { deleteProject, getProject, updateProject } from '@/db/queries/projects';
import { readJson, withAuth } from '@/lib/server/auth/with-auth';
import { notFound } from '@/lib/errors';
import { idOr404 } from '@/lib/ids';
import { projectUpdateSchema } from '@/lib/schemas/project';

type P = { projectId: string };


export const GET = withAuth<P>(
  async (_req, { actor, params }) => {
    const project = await getProject(actor.labId, idOr404(params.projectId, 'project'));
    if (!project) throw notFound('No such project');
    return NextResponse.json({ project });
  },
  { permission: 'project.read' },
);

export const PATCH = withAuth<P>(
  async (req, { actor, params }) => {
    const id = idOr404(params.projectId, 'project');
    const input = projectUpdateSchema.parse(await readJson(req));
    const project = await updateProject(actor.labId, actor.user.id, id, input);
    if (!project) throw notFound('No such project');
    return NextResponse.json({ project });
  },
  { permission: 'project.write' },
);

export const DELETE = withAuth<P>(
  async (_req, { actor, params }) => {
    const ok = await deleteProject(actor.labId, actor.user.id, idOr404(params.projectId, 'project'));
    if (!ok) throw notFound('No such project');
    return new NextResponse(null, { status: 204 });
  },
  { permission: 'project.delete' },
);
