// A queue of photos uploaded to a reference set, one photo per request and two requests at a time,
// with each photo's progress and outcome (stored, already in the set, refused with the reason).
import { useCallback, useRef, useState } from 'react';
import type { ImageLabel } from '../shared/api/references';
import { ApiError, uploadReferencePhotos, type UploadablePhoto } from '../lib/api';
import { explainError } from '../lib/errorMessages';

export type UploadStatus = 'waiting' | 'sending' | 'stored' | 'duplicate' | 'refused' | 'failed';

export interface UploadItem {
  id: string;
  name: string;
  /** Bytes, when known (files picked in a browser). */
  size: number | null;
  /** 0..1 of this photo's request body sent. */
  progress: number;
  status: UploadStatus;
  message: string | null;
}

const PARALLEL_REQUESTS = 2;
let uploadCounter = 0;

export interface UploadDefaults {
  label?: ImageLabel;
  defectKind?: string;
}

export function usePhotoUploads(setId: string, onBatchDone: () => void) {
  const [items, setItems] = useState<UploadItem[]>([]);
  const running = useRef(0);
  const queue = useRef<{ id: string; photo: UploadablePhoto; defaults: UploadDefaults }[]>([]);

  const update = useCallback((id: string, patch: Partial<UploadItem>) => {
    setItems((list) => list.map((item) => (item.id === id ? { ...item, ...patch } : item)));
  }, []);

  const pump = useCallback(() => {
    while (running.current < PARALLEL_REQUESTS && queue.current.length > 0) {
      const next = queue.current.shift()!;
      running.current += 1;
      update(next.id, { status: 'sending' });
      uploadReferencePhotos(setId, [next.photo], { ...next.defaults, onProgress: (sent) => update(next.id, { progress: sent }) })
        .then(([outcome]) => {
          if (!outcome) update(next.id, { status: 'failed', message: 'The server gave no outcome for this photo.' });
          else if (outcome.status === 'stored') update(next.id, { status: 'stored', progress: 1, message: `${outcome.image.width}×${outcome.image.height}, ${outcome.image.bitDepth}-bit` });
          else if (outcome.status === 'duplicate') update(next.id, { status: 'duplicate', progress: 1, message: 'Already in this set: not stored twice.' });
          else update(next.id, { status: 'refused', progress: 1, message: outcome.message });
        })
        // A 4xx answer is the server refusing this photo (too large, wrong type): sending it again will not help.
        .catch((error: unknown) =>
          update(next.id, { status: error instanceof ApiError && error.status >= 400 && error.status < 500 ? 'refused' : 'failed', message: explainError(error).message }),
        )
        .finally(() => {
          running.current -= 1;
          if (running.current === 0 && queue.current.length === 0) onBatchDone();
          pump();
        });
    }
  }, [setId, update, onBatchDone]);

  const add = useCallback(
    (photos: (UploadablePhoto & { size?: number })[], defaults: UploadDefaults) => {
      const added = photos.map((photo) => {
        uploadCounter += 1;
        return { id: `upload-${uploadCounter}`, photo, defaults, item: { id: `upload-${uploadCounter}`, name: photo.name, size: photo.size ?? null, progress: 0, status: 'waiting' as const, message: null } };
      });
      setItems((list) => [...list, ...added.map((a) => a.item)]);
      queue.current.push(...added.map(({ id, photo, defaults: d }) => ({ id, photo, defaults: d })));
      pump();
    },
    [pump],
  );

  const clearFinished = useCallback(() => setItems((list) => list.filter((i) => i.status === 'waiting' || i.status === 'sending')), []);

  const known = items.filter((i) => i.size !== null);
  const batchProgress =
    items.length === 0
      ? 0
      : known.length === items.length
        ? known.reduce((s, i) => s + i.progress * i.size!, 0) / Math.max(1, known.reduce((s, i) => s + i.size!, 0))
        : items.reduce((s, i) => s + i.progress, 0) / items.length;

  return { items, add, clearFinished, batchProgress, busy: items.some((i) => i.status === 'waiting' || i.status === 'sending') };
}
