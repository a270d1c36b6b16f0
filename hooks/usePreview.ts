// The draft editor's live preview: the photo's samples as the server decodes them, the same engine
// run in the browser after each change, the time from change to updated preview, and a check of the
// browser's numbers against the server, which stays the authority. When a change runs: previewPause.ts.
import { useEffect, useRef, useState } from 'react';
import { useMutation, useQuery } from '@tanstack/react-query';
import type { PreviewResult } from '../shared/api/preview';
import { validateRuleDocument } from '../shared/rules/schema';
import { prepareEngine, type EngineName } from '../shared/vision/engine';
import { ImageWorkspace } from '../shared/vision/workspace';
import { releaseRun, remeasureRun, RuleRunError, runRule, type KernelLibrary, type RuleRun } from '../shared/vision/pipeline';
import { fetchPhotoSamples, runServerPreview, type PhotoSamples } from '../lib/api';
import { formatGaugeValue } from '../lib/format';
import { previewPauseMs } from './previewPause';

/** One frame: "Updating…" is on screen before the run takes the main thread. */
const NEXT_FRAME_MS = 16;

export const previewKeys = {
  all: ['preview'] as const,
  samples: (imageId: string) => [...previewKeys.all, 'samples', imageId] as const,
};

export function usePhotoSamples(photo: { id: string; imageUrl: string } | null) {
  return useQuery({
    queryKey: previewKeys.samples(photo?.id ?? ''),
    queryFn: ({ signal }) => fetchPhotoSamples(photo!.imageUrl, signal),
    enabled: photo !== null,
    staleTime: Infinity,
    // A 5 MP photo's samples are 5-30 MB: keep only the ones in use for long.
    gcTime: 60_000,
  });
}

export interface LocalPreview {
  run: RuleRun | null;
  error: RuleRunError | Error | null;
  /** From the change that asked for this run to the updated preview on screen, in ms. */
  changeToPreviewMs: number | null;
  /** The pause for typing that run waited (0 when it ran at the next frame). */
  pauseMs: number;
  /** True when the last change touched only gauges or limits, measured again on the kept images (run.ms is that time). */
  gaugesOnly: boolean;
  running: boolean;
  /** The engine the preview runs on: WebAssembly SIMD where the browser has it, else plain TypeScript. */
  engine: EngineName | null;
}

interface LocalPreviewInput {
  document: unknown;
  /** performance.now() of the change that produced `document`. */
  changedAt: number;
  samples: PhotoSamples | undefined;
  kernels: KernelLibrary;
  mmPerPx: number | undefined;
}

export function useLocalPreview({ document, changedAt, samples, kernels, mmPerPx }: LocalPreviewInput): LocalPreview {
  // The runs' images live in the engine's memory (WebAssembly with the SIMD engine), reused run after run.
  const workspace = useRef<ImageWorkspace | null>(null);
  workspace.current ??= new ImageWorkspace();
  const current = useRef<RuleRun | null>(null);
  const [outcome, setOutcome] = useState<{ run: RuleRun | null; error: RuleRunError | Error | null; askedAt: number; pauseMs: number; gaugesOnly: boolean }>({
    run: null,
    error: null,
    askedAt: 0,
    pauseMs: 0,
    gaugesOnly: false,
  });
  const lastChange = useRef(Number.NEGATIVE_INFINITY);
  const lastRunMs = useRef(0);
  /** The photo samples and kernel library the kept run was made with. */
  const lastInputs = useRef<{ samples: PhotoSamples | null; kernels: KernelLibrary | null }>({ samples: null, kernels: null });
  const [changeToPreviewMs, setChangeToPreviewMs] = useState<number | null>(null);
  const [running, setRunning] = useState(false);
  const [engine, setEngineName] = useState<EngineName | null>(null);
  const documentKey = JSON.stringify(document);

  // A browser compiles the SIMD module asynchronously on its main thread: the first run waits for it (a few ms).
  useEffect(() => {
    let mounted = true;
    void prepareEngine().then((name) => mounted && setEngineName(name));
    return () => {
      mounted = false;
    };
  }, []);

  // Leaving the editor hands the last run's buffers back and lets go of the spare ones.
  useEffect(
    () => () => {
      const ws = workspace.current;
      if (!ws) return;
      if (current.current) releaseRun(current.current, ws);
      current.current = null;
      ws.dispose();
    },
    [],
  );

  useEffect(() => {
    if (!samples || engine === null) return;
    const ws = workspace.current!;
    const askedAt = changedAt;
    const document: unknown = JSON.parse(documentKey);
    // A change of gauges, limits, regions or quality limits only: measured again on the last run's images.
    const last = current.current;
    if (last && lastInputs.current.samples === samples && lastInputs.current.kernels === kernels) {
      try {
        const again = remeasureRun(last, document, { mmPerPx });
        if (again) {
          current.current = again;
          lastChange.current = performance.now();
          setOutcome({ run: again, error: null, askedAt, pauseMs: 0, gaugesOnly: true });
          setRunning(false);
          return;
        }
      } catch (error) {
        // Only mm gauges without calibration are refused here; the run keeps its images for the next change.
        setOutcome({ run: null, error: error instanceof Error ? error : new Error(String(error)), askedAt, pauseMs: 0, gaugesOnly: true });
        setRunning(false);
        return;
      }
    }
    setRunning(true);
    const now = performance.now();
    const pauseMs = previewPauseMs({ sinceLastChangeMs: now - lastChange.current, lastRunMs: lastRunMs.current, valid: validateRuleDocument(document).ok });
    lastChange.current = now;
    const timer = setTimeout(() => {
      if (current.current) releaseRun(current.current, ws);
      current.current = null;
      try {
        const run = runRule(document, samples, { kernels, mmPerPx, workspace: ws, retain: 'all' });
        current.current = run;
        lastInputs.current = { samples, kernels };
        lastRunMs.current = run.ms;
        setOutcome({ run, error: null, askedAt, pauseMs, gaugesOnly: false });
      } catch (error) {
        setOutcome({ run: null, error: error instanceof Error ? error : new Error(String(error)), askedAt, pauseMs, gaugesOnly: false });
      }
      setRunning(false);
    }, pauseMs || NEXT_FRAME_MS);
    return () => clearTimeout(timer);
  }, [documentKey, samples, kernels, mmPerPx, changedAt, engine]);

  // Child canvases draw in their own effects, which run before this one; the next frame is when the picture is on screen.
  useEffect(() => {
    if (!outcome.run || outcome.askedAt === 0) return;
    const frame = requestAnimationFrame(() => setChangeToPreviewMs(performance.now() - outcome.askedAt));
    return () => cancelAnimationFrame(frame);
  }, [outcome]);

  return { run: outcome.run, error: outcome.error, changeToPreviewMs, pauseMs: outcome.pauseMs, gaugesOnly: outcome.gaugesOnly, running, engine };
}

export interface ServerComparison {
  agrees: boolean;
  lines: string[];
}

/** Relative tolerance for float32 sums computed in a different order (browser vs worker thread). */
const RELATIVE_TOLERANCE = 1e-4;

function close(a: number, b: number): boolean {
  return Math.abs(a - b) <= RELATIVE_TOLERANCE * Math.max(1, Math.abs(a), Math.abs(b));
}

export function compareWithServer(run: RuleRun, server: PreviewResult): ServerComparison {
  const lines: string[] = [];
  let agrees = run.verdict === server.verdict;
  lines.push(run.verdict === server.verdict ? `Verdict: both ${server.verdict}` : `Verdict: browser ${run.verdict}, server ${server.verdict}`);
  for (const m of run.measurements) {
    const other = server.measurements.find((s) => s.name === m.name);
    if (!other) {
      agrees = false;
      lines.push(`${m.name}: the server did not measure it`);
    } else if (close(m.value, other.value)) {
      lines.push(`${m.name}: both ${formatGaugeValue(m.value)}`);
    } else {
      agrees = false;
      lines.push(`${m.name}: browser ${formatGaugeValue(m.value)}, server ${formatGaugeValue(other.value)}`);
    }
  }
  return { agrees, lines };
}

export function useServerPreview() {
  return useMutation({ mutationFn: (body: { document: unknown; referenceImageId: string; stationId?: string }) => runServerPreview(body) });
}
