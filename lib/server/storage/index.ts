import { randomUUID } from 'node:crypto';
import { getEnv, storageDir } from '../../env';
import { LocalStorage } from './local';
import { createS3Storage } from './s3';
import type { StorageDriver } from './types';

export type { StorageDriver } from './types';
export { LocalStorage } from './local';

const g = globalThis as unknown as { __veilmeterStorage?: StorageDriver };

/** The configured storage driver (local folder under storageDir() unless STORAGE_DRIVER says otherwise). */
export function getStorage(): StorageDriver {
  if (!g.__veilmeterStorage) {
    const env = getEnv();
    g.__veilmeterStorage = env.STORAGE_DRIVER === 's3' ? createS3Storage() : new LocalStorage(storageDir(env));
  }
  return g.__veilmeterStorage;
}

/** A fresh key for an original photo; the lab's id keeps one lab's objects apart from another's. */
export const photoKey = (labId: string, ext: string) => `photos/${labId}/${randomUUID()}.${ext}`;
export const previewKey = (labId: string) => `previews/${labId}/${randomUUID()}.webp`;
export const artifactKey = (labId: string, analysisId: string, name: 'log-contrast' | 'difference') => `artifacts/${labId}/${analysisId}/${name}.png`;

/** Best-effort removal (used after the rows are gone): a leftover file is harmless, a thrown error here is not. */
export async function deleteKeys(keys: readonly string[]): Promise<void> {
  const storage = getStorage();
  await Promise.all(keys.map((k) => storage.delete(k).catch((e: unknown) => console.error('[storage] could not delete', k, e))));
}
