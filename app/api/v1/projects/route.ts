import { NextResponse } from 'next/server';
import { listProjects } from '@/db/queries/projects';
import { listRevisions } from '@/db/queries/revisions';
import { withAuth } from '@/lib/auth/with-auth';

/** The lab's projects with their revisions, so a rig can find where its captures belong. */
export const GET = withAuth(
  async (_req, { actor }) => {
    const projects = await listProjects(actor.labId);
    const out = [];
    for (const p of projects) {
      const revisions = await listRevisions(actor.labId, p.id);
      out.push({ id: p.id, name: p.name, revisions: revisions.map((r) => ({ id: r.id, label: r.label, position: r.position, status: r.status })) });
    }
    return NextResponse.json({ projects: out });
  },
  { permission: 'project.read' },
);
