'use client';

import type { PhotoRole } from '@/lib/schemas/upload';

export type UploadOutcome = { ok: true; duplicate: boolean } | { ok: false; message: string };

/** Sends one file as a new photo of a role. */
export function uploadPhoto(captureSetId: string, role: PhotoRole, file: File, onProgress: (fraction: number) => void): Promise<UploadOutcome> {
  return sendFile(`/api/captures/${captureSetId}/photos?role=${role}`, file, onProgress);
}

/** Sends one file in place of a stored photo (it takes that photo's role; the old one goes). */
export function replacePhoto(captureSetId: string, photoId: string, file: File, onProgress: (fraction: number) => void): Promise<UploadOutcome> {
  return sendFile(`/api/captures/${captureSetId}/photos/${photoId}/replace`, file, onProgress);
}

/**
 * Sends one file as the request body. XMLHttpRequest rather than fetch: only it reports upload
 * progress in browsers today.
 */
function sendFile(url: string, file: File, onProgress: (fraction: number) => void): Promise<UploadOutcome> {
  return new Promise((resolve) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.setRequestHeader('x-file-name', encodeURIComponent(file.name));
    xhr.setRequestHeader('content-type', 'application/octet-stream');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const body = parseBody(xhr.responseText);
      if (xhr.status >= 200 && xhr.status < 300) resolve({ ok: true, duplicate: !!body?.duplicate });
      else resolve({ ok: false, message: body?.error?.message ?? `The upload was refused (${xhr.status})` });
    };
    xhr.onerror = () => resolve({ ok: false, message: 'The connection dropped during the upload. Try again.' });
    xhr.send(file);
  });
}

function parseBody(text: string): { error?: { message?: string }; duplicate?: boolean } | null {
  try {
    return JSON.parse(text) as { error?: { message?: string }; duplicate?: boolean };
  } catch {
    return null;
  }
}
