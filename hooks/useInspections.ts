// The operator's inspections: send a photo (or keep it on the device while the server is out of
// reach), dispute a verdict, and replay the queue of waiting photos when the server is back.
import { useCallback, useEffect, useRef, useState } from 'react';
import { useMutation, useQuery } from '@tanstack/react-query';
import { ApiError, disputeInspection, listRules, uploadInspection, type InspectionUpload } from '../lib/api';
import { isWorthRetrying } from '../lib/errorMessages';
import { enqueuePhoto, listQueuedPhotos, onQueueChange, removeQueuedPhoto } from '../lib/inspectQueue';
import type { Inspection } from '../shared/api/inspections';

export const inspectionKeys = {
  all: ['inspections'] as const,
  detail: (id: string) => [...inspectionKeys.all, id] as const,
  releasedRules: () => [...inspectionKeys.all, 'released-rules'] as const,
};

/** Rules the operator may inspect with: those with a released version. */
export function useReleasedRules() {
  return useQuery({
    queryKey: inspectionKeys.releasedRules(),
    queryFn: async ({ signal }) => (await listRules({ limit: 200, offset: 0 }, signal)).items.filter((rule) => rule.releasedVersion !== null),
  });
}

export type InspectOutcome = { kind: 'verdict'; inspection: Inspection } | { kind: 'queued' };

/** Sends one photo; when the network or the server fails, the photo waits in the queue with the same key. */
export function useInspectPhoto() {
  const [progress, setProgress] = useState(0);
  const mutation = useMutation({
    // Run even when the browser says it is offline: the photo must then go to the device queue, not wait in memory.
    networkMode: 'always',
    mutationFn: async (upload: InspectionUpload): Promise<InspectOutcome> => {
      setProgress(0);
      try {
        return { kind: 'verdict', inspection: await uploadInspection(upload, setProgress) };
      } catch (error) {
        if (!isWorthRetrying(error)) throw error;
        await enqueuePhoto({ ...upload, queuedAt: new Date().toISOString() });
        return { kind: 'queued' };
      }
    },
  });
  return { ...mutation, progress };
}

export function useDisputeInspection() {
  return useMutation({ mutationFn: ({ id, note }: { id: string; note: string }) => disputeInspection(id, note) });
}

export interface QueueRefusal {
  fileName: string;
  message: string;
}

const RETRY_INTERVAL_MS = 20_000;

/** The waiting photos: their count, and a sender that runs on an interval, on the browser's 'online' event, and on demand. */
export function useQueuedPhotos() {
  const [count, setCount] = useState(0);
  const [sending, setSending] = useState(false);
  const [delivered, setDelivered] = useState<Inspection[]>([]);
  const [refused, setRefused] = useState<QueueRefusal[]>([]);
  const busy = useRef(false);

  const refreshCount = useCallback(async () => setCount((await listQueuedPhotos()).length), []);

  const sendWaiting = useCallback(async () => {
    if (busy.current) return;
    busy.current = true;
    setSending(true);
    try {
      for (const item of await listQueuedPhotos()) {
        try {
          const inspection = await uploadInspection(item);
          await removeQueuedPhoto(item.idempotencyKey);
          // The count first: the verdict must not show while the banner still counts its photo as waiting
          // (a count that cannot be read now is read again on the queue's change event).
          await refreshCount().catch(() => undefined);
          setDelivered((list) => [inspection, ...list]);
        } catch (error) {
          if (isWorthRetrying(error)) break;
          // Refused for good (the rule was withdrawn, the photo unreadable...): say so instead of retrying forever.
          await removeQueuedPhoto(item.idempotencyKey);
          await refreshCount().catch(() => undefined);
          setRefused((list) => [...list, { fileName: item.fileName, message: error instanceof ApiError ? error.message : 'The server refused the photo.' }]);
        }
      }
    } finally {
      busy.current = false;
      setSending(false);
    }
  }, [refreshCount]);

  useEffect(() => {
    void refreshCount();
    const stopWatching = onQueueChange(() => void refreshCount());
    const timer = setInterval(() => void sendWaiting(), RETRY_INTERVAL_MS);
    const online = () => void sendWaiting();
    if (typeof window !== 'undefined') window.addEventListener('online', online);
    void sendWaiting();
    return () => {
      stopWatching();
      clearInterval(timer);
      if (typeof window !== 'undefined') window.removeEventListener('online', online);
    };
  }, [refreshCount, sendWaiting]);

  return {
    count,
    sending,
    delivered,
    refused,
    sendWaiting,
    dismissDelivered: () => setDelivered([]),
    dismissRefused: () => setRefused([]),
  };
}
