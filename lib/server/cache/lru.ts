/**
 * A least-recently-used map bounded by the bytes of its values, not their count: a few large
 * answers must not push the process's memory up unnoticed.
 */
export class ByteLru<V> {
  private readonly entries = new Map<string, { value: V; bytes: number }>();
  private total = 0;

  constructor(
    readonly maxBytes: number,
    // a single value this large would evict everything else for one key's sake
    readonly maxEntryBytes = Math.floor(maxBytes / 4),
  ) {}

  get size(): number {
    return this.entries.size;
  }

  get bytes(): number {
    return this.total;
  }

  get(key: string): V | undefined {
    const e = this.entries.get(key);
    if (!e) return undefined;
    // Map keeps insertion order, so re-inserting makes it the most recent
    this.entries.delete(key);
    this.entries.set(key, e);
    return e.value;
  }

  set(key: string, value: V, bytes: number): void {
    this.delete(key);
    if (bytes > this.maxEntryBytes) return;
    this.entries.set(key, { value, bytes });
    this.total += bytes;
    for (const [k, e] of this.entries) {
      if (this.total <= this.maxBytes) break;
      this.entries.delete(k);
      this.total -= e.bytes;
    }
  }

  delete(key: string): void {
    const e = this.entries.get(key);
    if (!e) return;
    this.entries.delete(key);
    this.total -= e.bytes;
  }

  clear(): void {
    this.entries.clear();
    this.total = 0;
  }
}
