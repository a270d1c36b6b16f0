// One reference set: add photos, filter and page through them, label one or many at once.
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import type { ImageLabel, ReferenceImage } from '../../shared/api/references';
import { colors, radius, space } from '../../lib/theme';
import { useDefectKinds, usePartTypeName, useReferenceImages, useReferenceSet } from '../../hooks/useReferenceSets';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import { Pagination } from '../Pagination';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { LabelDialog } from './LabelDialog';
import { PhotoUploader } from './PhotoUploader';
import { ReferenceImageGrid } from './ReferenceImageGrid';

const PAGE_SIZE = 48;

export function ReferenceSetPage({ id }: { id: string }) {
  const router = useRouter();
  const set = useReferenceSet(id);
  const partTypeNameOf = usePartTypeName();
  const defectKinds = useDefectKinds();
  const [label, setLabel] = useState<ImageLabel | null>(null);
  const [defectKind, setDefectKind] = useState<string | null>(null);
  const [offset, setOffset] = useState(0);
  const [selecting, setSelecting] = useState(false);
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [labelling, setLabelling] = useState<{ ids: string[]; current?: ReferenceImage } | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const images = useReferenceImages(id, { label, defectKind, limit: PAGE_SIZE, offset });

  if (set.isError) {
    return (
      <Screen title="Reference set">
        <ErrorState error={set.error} onRetry={() => void set.refetch()} />
        <Button label="Back to reference sets" variant="secondary" onPress={() => router.replace('/reference-sets')} />
      </Screen>
    );
  }
  if (!set.data) {
    return (
      <Screen title="Reference set">
        <LoadingState label="Loading the reference set…" />
      </Screen>
    );
  }
  const { counts } = set.data;
  const partTypeName = partTypeNameOf(set.data.partType);
  const filtered = label !== null || defectKind !== null;
  const toggle = (image: ReferenceImage) =>
    setSelected((s) => {
      const next = new Set(s);
      if (next.has(image.id)) next.delete(image.id);
      else next.add(image.id);
      return next;
    });

  return (
    <Screen
      title={set.data.name}
      subtitle={`${partTypeName} · ${counts.total} photos: ${counts.good} good, ${counts.defective} defective, ${counts.retake} retake, ${counts.unlabelled} unlabelled`}
      actions={<Button label="All reference sets" variant="secondary" onPress={() => router.push('/reference-sets')} />}
    >
      {set.data.description ? <AppText>{set.data.description}</AppText> : null}
      <Card>
        <AppText variant="heading">Add photos</AppText>
        <PhotoUploader setId={id} />
      </Card>
      <View style={styles.filters}>
        <ChoiceChips
          label="Show"
          choices={[
            { value: null, label: `All (${counts.total})` },
            { value: 'good', label: `Good (${counts.good})` },
            { value: 'defective', label: `Defective (${counts.defective})` },
            { value: 'retake', label: `Retake (${counts.retake})` },
            { value: 'unlabelled', label: `Unlabelled (${counts.unlabelled})` },
          ]}
          value={label}
          onChange={(v) => {
            setLabel(v);
            if (v !== 'defective') setDefectKind(null);
            setOffset(0);
          }}
        />
        {label === 'defective' && defectKinds.data ? (
          <ChoiceChips label="Defect kind" choices={[{ value: null, label: 'Any' }, ...defectKinds.data.map((k) => ({ value: k.code, label: k.name }))]} value={defectKind} onChange={(v) => { setDefectKind(v); setOffset(0); }} />
        ) : null}
      </View>
      <View style={styles.selectBar}>
        {selecting ? (
          <>
            <AppText variant="bodyStrong" style={styles.grow} role="status">{`${selected.size} selected`}</AppText>
            <Button label="Select this page" variant="secondary" compact onPress={() => setSelected(new Set([...selected, ...(images.data?.items ?? []).map((i) => i.id)]))} />
            <Button label={`Label ${selected.size} photos`} compact disabled={selected.size === 0} onPress={() => setLabelling({ ids: [...selected] })} />
            <Button label="Done selecting" variant="quiet" compact onPress={() => { setSelecting(false); setSelected(new Set()); }} />
          </>
        ) : (
          <>
            <AppText tone="muted" style={styles.grow}>Press a photo to label it, or select several to label them at once.</AppText>
            <Button label="Select photos" variant="secondary" compact onPress={() => setSelecting(true)} />
          </>
        )}
      </View>
      {notice ? <AppText tone="notice" role="status">{`✓ ${notice}`}</AppText> : null}
      {images.isError && !images.data ? (
        <ErrorState error={images.error} onRetry={() => void images.refetch()} />
      ) : !images.data ? (
        <LoadingState label="Loading photos…" />
      ) : images.data.items.length === 0 ? (
        <EmptyState
          title={filtered ? 'No photos with this label' : 'No photos yet'}
          body={filtered ? 'Show all photos, or label some first.' : 'Add photos of known good and known defective parts above, then label them.'}
          action={filtered ? <Button label="Show all photos" variant="secondary" onPress={() => { setLabel(null); setDefectKind(null); }} /> : undefined}
        />
      ) : (
        <View style={[styles.results, images.isPlaceholderData && styles.stale]}>
          <ReferenceImageGrid
            images={images.data.items}
            selecting={selecting}
            selected={selected}
            onPress={(image) => (selecting ? toggle(image) : setLabelling({ ids: [image.id], current: image }))}
          />
          <Pagination offset={offset} limit={PAGE_SIZE} shown={images.data.items.length} total={images.data.total} noun="photos" onChange={setOffset} />
        </View>
      )}
      {labelling ? (
        <LabelDialog
          setId={id}
          imageIds={labelling.ids}
          current={labelling.current ? { label: labelling.current.label, defectKind: labelling.current.defectKind } : undefined}
          onClose={() => setLabelling(null)}
          onDone={(count) => {
            setLabelling(null);
            setSelected(new Set());
            setSelecting(false);
            setNotice(`Labelled ${count} photo${count === 1 ? '' : 's'}.`);
          }}
        />
      ) : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  filters: { gap: space.md, padding: space.lg, borderRadius: radius.lg, backgroundColor: colors.surfaceSunken },
  selectBar: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  grow: { flexGrow: 1, flexShrink: 1, flexBasis: 200 },
  results: { gap: space.md },
  stale: { opacity: 0.6 },
});
