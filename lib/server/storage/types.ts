/** What every storage back end offers: opaque keys, whole objects. Shaped so an object store fits. */
export interface StorageDriver {
  put(key: string, bytes: Uint8Array, options?: { contentType?: string }): Promise<void>;
  /** The object's bytes, or null when there is none under the key. */
  get(key: string): Promise<Buffer | null>;
  stat(key: string): Promise<{ bytes: number } | null>;
  /** Removes the object; removing a missing key is not an error. */
  delete(key: string): Promise<void>;
}

/** Keys are made here, never from user input: a user's file name never reaches a path. */
export const KEY_PATTERN = /^[a-z]+(\/[a-z0-9-]+)+(\.[a-z0-9]+)?$/;

export function assertKey(key: string): void {
  if (!KEY_PATTERN.test(key) || key.includes('..')) throw new RangeError(`not a storage key: ${key}`);
}
