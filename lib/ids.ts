// Id generation shared by server and client: random UUIDs, which field devices can mint offline.
export function newId(): string {
  return globalThis.crypto.randomUUID();
}
