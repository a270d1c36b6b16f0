// The open draft of a rule: pipeline, gauges and quality gate on one side, the live preview on the
// other (below on a phone), trials and submission underneath. Saves through the server, which names
// every problem by its path; the same schema marks problems here as they are typed.
import { useCallback, useMemo, useReducer, useState } from 'react';
import { ScrollView, StyleSheet, View, useWindowDimensions } from 'react-native';
import type { RuleDetail, RuleVersion } from '../../shared/api/rules';
import type { FieldIssue } from '../../shared/api/errors';
import { validateRuleDocument, type Region } from '../../shared/rules/schema';
import { ApiError } from '../../lib/api';
import { stickyColumnStyle, stickyStyle } from '../../lib/sticky';
import { colors, radius, space } from '../../lib/theme';
import { useKernels } from '../../hooks/useKernels';
import { useLayout } from '../../hooks/useLayout';
import { useLeaveGuard } from '../../hooks/useLeaveGuard';
import { useSaveDraft } from '../../hooks/useRules';
import { useLines } from '../../hooks/useStations';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';
import { PreviewPanel, type PreviewTarget } from '../preview/PreviewPanel';
import { TrialPanel } from '../trials/TrialPanel';
import { DocumentSettingsEditor } from './DocumentSettingsEditor';
import { GaugeEditor } from './GaugeEditor';
import { PipelineEditor } from './PipelineEditor';
import { QualityGateEditor } from './QualityGateEditor';
import { UnreadableFieldsContext, useUnreadableFieldCount } from './unreadableFields';
import { canonicalJson, documentFrom, editorReducer, editorStateFrom, issuesByKey, type EditorAction } from './ruleEditorState';

interface DraftEditorProps {
  rule: RuleDetail;
  version: RuleVersion;
  canEdit: boolean;
  onSubmitted: () => void;
}

export function DraftEditor({ rule, version, canEdit, onSubmitted }: DraftEditorProps) {
  const layout = useLayout();
  const kernels = useKernels();
  const lines = useLines();
  const save = useSaveDraft();
  const resetSave = save.reset;
  const [state, dispatchRaw] = useReducer(editorReducer, version.document, editorStateFrom);
  const [baseline, setBaseline] = useState(() => canonicalJson(documentFrom(editorStateFrom(version.document))));
  const [changedAt, setChangedAt] = useState(0);
  const [serverIssues, setServerIssues] = useState<FieldIssue[]>([]);
  const [drawingKey, setDrawingKey] = useState<string | null>(null);
  const [stationId, setStationId] = useState<string | null>(null);
  const [target, setTarget] = useState<PreviewTarget>({ setId: null, imageId: null });
  const [notice, setNotice] = useState<string | null>(null);
  // The toolbar stays at the top of the screen; on a wide screen the preview column stays in sight
  // under it and scrolls on its own, so that the picture follows the step being edited.
  const [toolbarHeight, setToolbarHeight] = useState(0);
  const { height: windowHeight } = useWindowDimensions();
  const previewTop = toolbarHeight + space.md;

  const dispatch = useCallback((action: EditorAction) => {
    // The moment of the change, from which the preview's update time is measured.
    setChangedAt(performance.now());
    setNotice(null);
    // The server's refusal described the document as it was sent; the editor's own checks cover the edited one.
    setServerIssues([]);
    resetSave();
    dispatchRaw(action);
  }, [resetSave]);

  const document = useMemo(() => documentFrom(state), [state]);
  const documentText = canonicalJson(document);
  // A field holding text that is not a number keeps its last number in the document: until it is
  // corrected the draft is neither saved nor savable.
  const unreadable = useUnreadableFieldCount();
  const unsaved = documentText !== baseline || unreadable.count > 0;
  useLeaveGuard(unsaved && canEdit ? `Version ${version.number} (draft) has changes that are not saved.` : null);
  const localIssues = useMemo(() => {
    const result = validateRuleDocument(document);
    return result.ok ? [] : result.issues;
  }, [document]);
  const { byKey, general } = issuesByKey(state, [...localIssues, ...serverIssues]);
  const stations = (lines.data ?? []).flatMap((l) => l.stations);

  const drawingGauge = state.gauges.find((g) => g.key === drawingKey);
  const drawing = drawingGauge?.gauge.region ? { key: drawingGauge.key, shape: drawingGauge.gauge.region.shape, index: state.gauges.indexOf(drawingGauge) } : null;
  const regions = state.gauges.flatMap((g) => (g.gauge.region ? [{ key: g.key, name: g.gauge.name, region: g.gauge.region }] : []));
  const onRegionDrawn = (key: string, region: Region) => {
    const entry = state.gauges.find((g) => g.key === key);
    if (entry) dispatch({ type: 'change-gauge', key, gauge: { ...entry.gauge, region }, stepKey: entry.stepKey });
  };

  const saveDraft = () => {
    setServerIssues([]);
    save.mutate(
      { versionId: version.id, document },
      {
        onSuccess: (saved) => {
          setBaseline(canonicalJson(documentFrom(editorStateFrom(saved.document))));
          setNotice(`Saved version ${saved.number} at ${new Date(saved.editedAt).toLocaleTimeString()}.`);
        },
        onError: (error) => setServerIssues(error instanceof ApiError ? error.fieldIssues : []),
      },
    );
  };

  const editor = (
    <View style={styles.column}>
      <Card>
        <AppText variant="heading">Photo input</AppText>
        <DocumentSettingsEditor state={state} issues={general} dispatch={dispatch} />
      </Card>
      <Card>
        <AppText variant="heading">Pipeline</AppText>
        <AppText variant="caption" tone="muted">Steps run in order; each reads the previous step’s output.</AppText>
        <PipelineEditor steps={state.steps} kernels={kernels.data ?? []} canSaveKernel={canEdit} issues={byKey} dispatch={dispatch} />
      </Card>
      <Card>
        <AppText variant="heading">Gauges and limits</AppText>
        <GaugeEditor gauges={state.gauges} steps={state.steps} issues={byKey} drawingKey={drawingKey} onDraw={setDrawingKey} dispatch={dispatch} />
      </Card>
      <Card>
        <AppText variant="heading">Photo quality gate</AppText>
        <AppText variant="caption" tone="muted">A photo below these is judged RETAKE, never PASS.</AppText>
        <QualityGateEditor quality={state.quality} issues={general} onChange={(quality) => dispatch({ type: 'set-quality', quality })} />
      </Card>
    </View>
  );

  const preview = (
    <Card style={styles.column}>
      <AppText variant="heading">Live preview</AppText>
      <PreviewPanel
        document={document}
        changedAt={changedAt}
        partType={rule.partType}
        smallestDefectMm={rule.smallestDefectMm}
        stations={stations}
        stationId={stationId}
        onStation={setStationId}
        target={target}
        onTarget={setTarget}
        regions={regions}
        drawing={drawing}
        onRegionDrawn={(key, region) => {
          onRegionDrawn(key, region);
          setDrawingKey(null);
        }}
      />
    </Card>
  );

  return (
    <UnreadableFieldsContext.Provider value={unreadable.fields}>
      <View style={styles.editor}>
        <View style={[styles.toolbar, layout === 'wide' ? null : styles.toolbarPhone, stickyStyle(0)]} role="toolbar" aria-label="Draft" onLayout={(e) => setToolbarHeight(e.nativeEvent.layout.height)}>
          <AppText variant="bodyStrong" style={styles.grow} role="status" aria-live="polite">
            {unreadable.count > 0
              ? `⚠ Version ${version.number} (draft): ${unreadable.count === 1 ? '1 field holds' : `${unreadable.count} fields hold`} text that is not a number; correct ${unreadable.count === 1 ? 'it' : 'them'} to save`
              : unsaved
                ? `✎ Version ${version.number} (draft) has unsaved changes`
                : `Version ${version.number} (draft) · saved`}
          </AppText>
          <Button label="Save draft" onPress={saveDraft} busy={save.isPending} disabled={!unsaved || !canEdit || unreadable.count > 0} accessibilityHint="Stores the draft on the server" />
          {serverIssues.length > 0 ? (
            // In the bar that stays on screen: on a phone the Save button is pressed far below the top of the page.
            <AppText tone="danger" variant="bodyStrong" accessibilityRole="alert" style={styles.refusal}>
              {`⚠ Not saved: the server found ${serverIssues.length === 1 ? '1 problem' : `${serverIssues.length} problems`}, marked ⚠ beside the fields below.`}
            </AppText>
          ) : null}
        </View>
        {notice ? <AppText tone="notice" role="status">{`✓ ${notice}`}</AppText> : null}
        {save.error && serverIssues.length === 0 ? <ErrorBanner error={save.error} /> : null}
        {general.filter((i) => !i.path.startsWith('quality') && i.path !== 'name').map((issue) => (
          <AppText key={`${issue.path}-${issue.message}`} tone="danger">{`⚠ ${issue.path}: ${issue.message}`}</AppText>
        ))}
        {layout === 'wide' ? (
          <View style={styles.columns}>
            <View style={styles.left}>{editor}</View>
            <View style={[styles.right, stickyColumnStyle(previewTop, windowHeight, space.lg)]}>
              <ScrollView accessibilityLabel="Live preview column" contentContainerStyle={styles.previewScroll}>{preview}</ScrollView>
            </View>
          </View>
        ) : (
          <>
            {editor}
            {preview}
          </>
        )}
        <Card>
          <AppText variant="heading">Trials and review</AppText>
          <TrialPanel
            version={version}
            partType={rule.partType}
            stations={stations}
            stationId={stationId}
            onStation={setStationId}
            unsaved={unsaved}
            gauges={state.gauges}
            onPickLimit={(gaugeName, bound, value) => dispatch({ type: 'set-limit', gaugeName, bound, value })}
            onOpenInPreview={(setId, imageId) => setTarget({ setId, imageId })}
            onSubmitted={onSubmitted}
          />
        </Card>
      </View>
    </UnreadableFieldsContext.Provider>
  );
}

const styles = StyleSheet.create({
  editor: { gap: space.lg },
  toolbar: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    gap: space.md,
    padding: space.md,
    borderRadius: radius.lg,
    backgroundColor: colors.surfaceSunken,
  },
  // On a phone the bar that stays on screen keeps to the Save button's height and a little.
  toolbarPhone: { paddingVertical: space.xs, gap: space.sm },
  grow: { flexGrow: 1, flexShrink: 1, flexBasis: 200 },
  refusal: { flexBasis: '100%' },
  columns: { flexDirection: 'row', gap: space.lg, alignItems: 'flex-start' },
  left: { flex: 5, minWidth: 0 },
  right: { flex: 6, minWidth: 0 },
  column: { gap: space.lg },
  previewScroll: { paddingBottom: space.xs },
});
