/** The error body every route handler sends, read into a message for the screen. */
export type ApiError = { message: string; fieldErrors?: Record<string, string[]> };

export class ApiRequestError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fieldErrors?: Record<string, string[]>,
  ) {
    super(message);
  }
}

export async function apiJson<T>(url: string, init?: RequestInit): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, { ...init, headers: { 'content-type': 'application/json', ...(init?.headers ?? {}) } });
  } catch {
    throw new ApiRequestError(0, 'The server could not be reached. Check the connection and try again.');
  }
  const body = (await res.json().catch(() => null)) as ({ error?: ApiError } & T) | null;
  if (!res.ok) throw new ApiRequestError(res.status, body?.error?.message ?? `The server answered ${res.status}`, body?.error?.fieldErrors);
  return body as T;
}
