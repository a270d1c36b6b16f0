// Photos that could not reach the server wait here, on this device, with the idempotency key they
// were first sent with, until the server answers again. IndexedDB keeps the photo as a Blob (a
// photo is too large for localStorage); without IndexedDB the queue lives as long as the page.

export interface QueuedPhoto {
  idempotencyKey: string;
  stationId: string;
  ruleVersionId: string;
  fileName: string;
  photo: Blob;
  queuedAt: string;
}

const DB_NAME = 'kernwright-inspect';
const STORE = 'queued-photos';

type Listener = () => void;
const listeners = new Set<Listener>();
const memory = new Map<string, QueuedPhoto>();

function openDatabase(): Promise<IDBDatabase> | null {
  if (typeof indexedDB === 'undefined') return null;
  return new Promise((resolve, reject) => {
    const open = indexedDB.open(DB_NAME, 1);
    open.onupgradeneeded = () => open.result.createObjectStore(STORE, { keyPath: 'idempotencyKey' });
    open.onsuccess = () => resolve(open.result);
    open.onerror = () => reject(open.error);
  });
}

async function withStore<T>(mode: IDBTransactionMode, act: (store: IDBObjectStore) => IDBRequest<T>): Promise<T | undefined> {
  const opening = openDatabase();
  if (!opening) return undefined;
  const db = await opening;
  try {
    return await new Promise<T>((resolve, reject) => {
      const request = act(db.transaction(STORE, mode).objectStore(STORE));
      request.onsuccess = () => resolve(request.result);
      request.onerror = () => reject(request.error);
    });
  } finally {
    db.close();
  }
}

function notify(): void {
  listeners.forEach((listener) => listener());
}

export async function enqueuePhoto(item: QueuedPhoto): Promise<void> {
  if (typeof indexedDB === 'undefined') memory.set(item.idempotencyKey, item);
  else await withStore('readwrite', (store) => store.put(item));
  notify();
}

/** Oldest first, so parts are recorded in the order they were photographed. */
export async function listQueuedPhotos(): Promise<QueuedPhoto[]> {
  const items = typeof indexedDB === 'undefined' ? [...memory.values()] : ((await withStore<QueuedPhoto[]>('readonly', (store) => store.getAll())) ?? []);
  return items.sort((a, b) => a.queuedAt.localeCompare(b.queuedAt));
}

export async function removeQueuedPhoto(idempotencyKey: string): Promise<void> {
  if (typeof indexedDB === 'undefined') memory.delete(idempotencyKey);
  else await withStore('readwrite', (store) => store.delete(idempotencyKey));
  notify();
}

export function onQueueChange(listener: Listener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}
