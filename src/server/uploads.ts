// Uploaded files waiting for their column mapping. Kept in memory for a short while under a
// random key (never the file name, which is never used as a path); the import itself stores the
// original bytes in the study.
import { randomBytes } from 'node:crypto';

export interface PendingUpload {
  readonly studyId: number;
  readonly owner: string;
  readonly fileName: string;
  readonly bytes: Uint8Array;
  readonly sheet?: string;
  readonly created: number;
}

const TTL_MS = 60 * 60_000; // one hour to finish the mapping step (common practice)
const MAX_PENDING = 20;

export class PendingUploads {
  private readonly items = new Map<string, PendingUpload>();

  put(item: Omit<PendingUpload, 'created'>): string {
    this.sweep();
    while (this.items.size >= MAX_PENDING) this.items.delete(this.items.keys().next().value!);
    const key = randomBytes(16).toString('base64url');
    this.items.set(key, { ...item, created: Date.now() });
    return key;
  }

  get(key: string, studyId: number, owner: string): PendingUpload | undefined {
    this.sweep();
    const item = this.items.get(key);
    return item && item.studyId === studyId && item.owner === owner ? item : undefined;
  }

  delete(key: string): void {
    this.items.delete(key);
  }

  private sweep(): void {
    const cutoff = Date.now() - TTL_MS;
    for (const [k, v] of this.items) if (v.created < cutoff) this.items.delete(k);
  }
}
