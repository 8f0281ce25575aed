'use server';

import { cookies } from 'next/headers';
import { revalidatePath } from 'next/cache';
import { requireActor, switchLab } from '@/lib/server/auth/session';
import { uuidSchema } from '@/lib/schemas/common';

export async function switchLabAction(form: FormData): Promise<void> {
  const actor = await requireActor();
  const labId = uuidSchema.safeParse(form.get('labId'));
  if (!labId.success) return;
  await switchLab(actor.user.id, labId.data);
  revalidatePath('/', 'layout');
}

export async function toggleThemeAction(): Promise<void> {
  const jar = await cookies();
  jar.set('vm-theme', jar.get('vm-theme')?.value === 'light' ? 'dark' : 'light', { path: '/', sameSite: 'lax', maxAge: 60 * 60 * 24 * 365 });
  revalidatePath('/', 'layout');
}
