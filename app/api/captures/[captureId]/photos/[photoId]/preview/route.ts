import { withAuth } from '@/lib/server/auth/with-auth';
import { servePhoto } from '../serve';

export const GET = withAuth<{ captureId: string; photoId: string }>(
  async (_req, { actor, params }) => servePhoto(actor.labId, params.captureId, params.photoId, 'preview'),
  { permission: 'capture.read' },
);
