// Live preview of the draft on a reference photo: the same engine as the server, run in the browser
// after each change; every step as a thumbnail, the chosen one large with the gauge regions, the
// gauge values, the verdict, and the time from the change to the updated picture.
import { useEffect, useMemo, useState } from 'react';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import type { Station } from '../../shared/api/stations';
import { regionSchema, type Region } from '../../shared/rules/schema';
import { RuleRunError, type RuleRun } from '../../shared/vision/pipeline';
import { stationTitle } from '../../lib/format';
import { colors, radius, space } from '../../lib/theme';
import { useKernelLibrary } from '../../hooks/useKernels';
import { useLabelWords, useReferenceImages } from '../../hooks/useReferenceSets';
import { compareWithServer, useLocalPreview, usePhotoSamples, useServerPreview } from '../../hooks/usePreview';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ChoiceChips } from '../ChoiceChips';
import { ErrorBanner } from '../ErrorBanner';
import { ErrorState, LoadingState } from '../StateViews';
import { VerdictMark } from '../inspect/VerdictMark';
import { MeasurementTable, valueWithUnit } from './MeasurementTable';
import { PICKER_PAGE, PhotoPicker } from './PhotoPicker';
import { RegionOverlay, type OverlayRegion } from './RegionOverlay';
import { SamplingNotice } from './SamplingNotice';
import { StepCanvas } from './StepCanvas';

export interface PreviewTarget {
  setId: string | null;
  imageId: string | null;
}

interface PreviewPanelProps {
  document: Record<string, unknown>;
  changedAt: number;
  partType: string;
  smallestDefectMm: number | null;
  stations: Station[];
  stationId: string | null;
  onStation: (id: string | null) => void;
  target: PreviewTarget;
  onTarget: (target: PreviewTarget) => void;
  regions: OverlayRegion[];
  /** The gauge whose region is being drawn: its key, shape and place among the document's gauges. */
  drawing: { key: string; shape: Region['shape']; index: number } | null;
  onRegionDrawn: (key: string, region: Region) => void;
}

/** The document with gauge `index` measuring inside `region` (the region under the finger while it drags). */
function withGaugeRegion(document: Record<string, unknown>, index: number, region: Region): Record<string, unknown> {
  const gauges = Array.isArray(document.gauges) ? (document.gauges as Record<string, unknown>[]) : [];
  return { ...document, gauges: gauges.map((g, i) => (i === index ? { ...g, region } : g)) };
}

const STEP_WORDS: Record<string, string> = {
  kernel: 'Kernel', gaussian: 'Gaussian', box: 'Box mean', median: 'Median', gradient: 'Gradient', laplacian: 'Laplacian', log: 'LoG',
  threshold: 'Threshold', erode: 'Erode', dilate: 'Dilate', open: 'Open', close: 'Close',
};
const ZOOMS = ['1', '2', '4'] as const;
const ENGINE_WORDS = { simd: 'WebAssembly SIMD', plain: 'plain TypeScript' } as const;

function stepOutputs(run: RuleRun) {
  return [
    { index: 0, title: 'Photo (rule’s channel)', image: run.input, kind: 'intensity' as const, ms: null as number | null },
    ...run.steps.filter((s) => s.output).map((s) => ({ index: s.index, title: `${s.index}. ${STEP_WORDS[s.op] ?? s.op}`, image: s.output!, kind: s.kind, ms: s.ms })),
  ];
}

export function PreviewPanel(props: PreviewPanelProps) {
  const { document, changedAt, partType, smallestDefectMm, stations, stationId, onStation, target, onTarget, regions, drawing, onRegionDrawn } = props;
  const kernels = useKernelLibrary();
  const labelText = useLabelWords();
  const station = stations.find((s) => s.id === stationId) ?? null;
  const setImages = useReferenceImages(target.setId, { label: null, defectKind: null, limit: PICKER_PAGE, offset: 0 });
  const image = setImages.data?.items.find((i) => i.id === target.imageId) ?? null;
  const samples = usePhotoSamples(image ? { id: image.id, imageUrl: image.imageUrl } : null);
  // While a region is dragged the preview measures inside it (the gauge alone, on the same images); the draft changes on release.
  const [rubber, setRubber] = useState<{ region: Region; at: number } | null>(null);
  const onDrawing = (region: Region | null) => setRubber(region && regionSchema.safeParse(region).success ? { region, at: performance.now() } : null);
  const previewDocument = useMemo(() => (rubber && drawing ? withGaugeRegion(document, drawing.index, rubber.region) : document), [document, rubber, drawing]);
  const preview = useLocalPreview({ document: previewDocument, changedAt: rubber?.at ?? changedAt, samples: samples.data, kernels, mmPerPx: station?.mmPerPx ?? undefined });
  const draggedMeasurement = drawing && preview.run?.measurements[drawing.index];
  const server = useServerPreview();
  const [selected, setSelected] = useState<number | null>(null);
  const [zoom, setZoom] = useState<(typeof ZOOMS)[number]>('1');
  const [frameWidth, setFrameWidth] = useState(480);

  useEffect(() => server.reset(), [JSON.stringify(document), target.imageId, stationId]); // eslint-disable-line react-hooks/exhaustive-deps

  const outputs = useMemo(() => (preview.run ? stepOutputs(preview.run) : []), [preview.run]);
  const shownIndex = selected !== null && outputs.some((o) => o.index === selected) ? selected : outputs[outputs.length - 1]?.index ?? 0;
  const shown = outputs.find((o) => o.index === shownIndex);
  const comparison = preview.run && server.data ? compareWithServer(preview.run, server.data) : null;
  const largeSide = Math.round(Math.max(320, frameWidth) * Number(zoom));

  return (
    <View style={styles.panel}>
      <PhotoPicker
        partType={partType}
        setId={target.setId}
        imageId={target.imageId}
        onSet={(setId) => onTarget({ setId, imageId: null })}
        onPhoto={(picked) => onTarget({ setId: picked.setId, imageId: picked.id })}
      />
      <ChoiceChips
        label="Station (its calibration turns px into mm)"
        choices={[{ value: '', label: 'None' }, ...stations.filter((s) => s.active).map((s) => ({ value: s.id, label: `${stationTitle(s)}${s.mmPerPx ? '' : ' (not calibrated)'}` }))]}
        value={stationId ?? ''}
        onChange={(id) => onStation(id === '' ? null : id)}
      />
      <SamplingNotice smallestDefectMm={smallestDefectMm} mmPerPx={station?.mmPerPx ?? null} stationName={station ? stationTitle(station) : null} />

      {!image ? (
        <AppText tone="muted">
          {target.setId ? 'Choose a reference photo above to see every step of the rule on it.' : 'Choose a reference set above, then one of its photos, to see every step of the rule on it.'}
        </AppText>
      ) : samples.isError ? (
        <ErrorState error={samples.error} onRetry={() => void samples.refetch()} />
      ) : !samples.data ? (
        <LoadingState label="Loading the photo’s samples…" />
      ) : preview.error ? (
        <View style={styles.problem} accessibilityRole="alert">
          <AppText variant="bodyStrong" tone="danger">⚠ The preview cannot run this draft yet</AppText>
          {(preview.error instanceof RuleRunError ? preview.error.issues : [{ path: '', message: preview.error.message }]).map((issue) => (
            <AppText key={`${issue.path}-${issue.message}`}>{issue.path ? `${issue.path}: ${issue.message}` : issue.message}</AppText>
          ))}
          <AppText tone="muted">
            {preview.error instanceof RuleRunError && preview.error.code === 'missing_calibration'
              ? 'Choose a calibrated station above; the preview updates by itself.'
              : 'Correct the marked steps or gauges; the preview updates by itself.'}
          </AppText>
        </View>
      ) : !preview.run ? (
        <LoadingState label="Running the rule on the photo…" />
      ) : (
        <View style={styles.results}>
          <View style={styles.verdictRow}>
            <VerdictMark verdict={preview.run.verdict} size={48} />
            <View style={styles.grow}>
              <AppText variant="heading" accessibilityLabel={`Preview verdict: ${preview.run.verdict}`}>{`Preview verdict: ${preview.run.verdict}`}</AppText>
              <AppText variant="caption" tone="muted">
                {`${image.fileName} · labelled ${labelText(image)} · ${samples.data.width}×${samples.data.height}, ${samples.data.bitDepth}-bit`}
              </AppText>
              <AppText variant="caption" tone="muted" role="status" aria-live="polite">
                {`${preview.running ? 'Updating… ' : ''}${preview.gaugesOnly ? `Gauges measured again on the same images in ${preview.run.ms.toFixed(0)} ms` : `Engine ${preview.run.ms.toFixed(0)} ms`}${preview.engine ? ` on ${ENGINE_WORDS[preview.engine]}` : ''}${preview.changeToPreviewMs !== null ? ` · change to updated preview ${preview.changeToPreviewMs.toFixed(0)} ms${preview.pauseMs > 0 ? ` (includes a ${preview.pauseMs} ms pause for typing)` : ''}` : ''}`}
              </AppText>
            </View>
          </View>
          {!preview.run.quality.pass ? (
            <AppText tone="caution">{`↻ The photo fails the quality gate: ${preview.run.quality.problems.join('; ')}`}</AppText>
          ) : null}
          <MeasurementTable measurements={preview.run.measurements} />

          <ScrollView horizontal contentContainerStyle={styles.strip} accessibilityLabel="Step outputs">
            {outputs.map((o) => (
              <Pressable
                key={o.index}
                accessibilityRole="button"
                accessibilityLabel={`Show ${o.title} large`}
                accessibilityState={{ selected: o.index === shownIndex }}
                onPress={() => setSelected(o.index)}
                style={[styles.thumb, o.index === shownIndex && styles.thumbSelected]}
              >
                <StepCanvas image={o.image} kind={o.kind} maxSide={160} label={`${o.title} output`} />
                <AppText variant="caption" numberOfLines={2}>{`${o.index === shownIndex ? '▸ ' : ''}${o.title}`}</AppText>
                {o.ms !== null ? <AppText variant="caption" tone="muted">{`${o.ms.toFixed(1)} ms`}</AppText> : null}
              </Pressable>
            ))}
          </ScrollView>

          {shown ? (
            <View style={styles.large}>
              <View style={styles.largeHeader}>
                <AppText variant="bodyStrong" style={styles.grow}>{shown.title}</AppText>
                <ChoiceChips label="Zoom" choices={ZOOMS.map((z) => ({ value: z, label: `${z}×` }))} value={zoom} onChange={setZoom} />
              </View>
              <View onLayout={(e) => setFrameWidth(e.nativeEvent.layout.width)}>
                {zoom === '1' ? (
                  <View>
                    <StepCanvas image={shown.image} kind={shown.kind} maxSide={largeSide} label={`${shown.title} output, large`} />
                    <RegionOverlay regions={regions} drawing={drawing} aspect={shown.image.width / shown.image.height} onDrawn={onRegionDrawn} onDrawing={onDrawing} />
                  </View>
                ) : (
                  <ScrollView horizontal style={styles.zoomBox}>
                    <ScrollView style={styles.zoomBox}>
                      <View style={{ width: frameWidth * Number(zoom) }}>
                        <StepCanvas image={shown.image} kind={shown.kind} maxSide={largeSide} label={`${shown.title} output, zoomed ${zoom} times`} />
                        <RegionOverlay regions={regions} drawing={drawing} aspect={shown.image.width / shown.image.height} onDrawn={onRegionDrawn} onDrawing={onDrawing} />
                      </View>
                    </ScrollView>
                  </ScrollView>
                )}
              </View>
              {/* Below the photo, so that the photo stays where it was when drawing starts (a hint above it pushed it down under the finger). */}
              {drawing ? (
                <AppText tone="caution" accessibilityLiveRegion="polite">
                  ✎ Drag across the photo, or tap two opposite corners, to set the region.
                </AppText>
              ) : null}
              {/* The measurement table may be off screen on a phone while the finger drags: the value under it shows here too. */}
              {drawing && rubber && draggedMeasurement ? (
                <AppText variant="bodyStrong" accessibilityLiveRegion="polite">
                  {`Inside this region: ${draggedMeasurement.name} ${valueWithUnit(draggedMeasurement.value, draggedMeasurement.unit)}, ${draggedMeasurement.pass ? '✓ within limits' : '✕ outside limits'}`}
                </AppText>
              ) : null}
            </View>
          ) : null}

          <View style={styles.serverRow}>
            <Button
              label="Check on server"
              variant="secondary"
              busy={server.isPending}
              accessibilityHint="Runs the same draft on the server, the authority for verdicts, and compares the numbers"
              onPress={() => server.mutate({ document, referenceImageId: image.id, stationId: stationId ?? undefined })}
            />
            {server.error ? <ErrorBanner error={server.error} /> : null}
            {comparison ? (
              <View style={[styles.comparison, comparison.agrees ? styles.agrees : styles.differs]} role="status">
                <AppText variant="bodyStrong" tone={comparison.agrees ? 'notice' : 'danger'}>
                  {comparison.agrees ? '✓ The server agrees with the preview' : '✕ The server’s numbers differ from the preview'}
                </AppText>
                {comparison.lines.map((line) => (
                  <AppText key={line} variant="caption">{line}</AppText>
                ))}
              </View>
            ) : null}
          </View>
        </View>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: space.md },
  results: { gap: space.md },
  verdictRow: { flexDirection: 'row', gap: space.md, alignItems: 'center' },
  grow: { flex: 1 },
  problem: { gap: space.xs, padding: space.md, borderLeftWidth: 4, borderLeftColor: colors.danger, backgroundColor: colors.dangerTint, borderRadius: radius.md },
  strip: { gap: space.sm },
  thumb: { width: 120, padding: space.xxs, borderRadius: radius.md, borderWidth: 2, borderColor: 'transparent', gap: space.xxs },
  thumbSelected: { borderColor: colors.steel, backgroundColor: colors.steelTint },
  large: { gap: space.sm },
  largeHeader: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end', gap: space.sm },
  zoomBox: { maxHeight: 640 },
  serverRow: { gap: space.sm },
  comparison: { gap: space.xxs, padding: space.sm, borderLeftWidth: 4, borderRadius: radius.sm },
  agrees: { borderLeftColor: colors.notice, backgroundColor: colors.noticeTint },
  differs: { borderLeftColor: colors.danger, backgroundColor: colors.dangerTint },
});
