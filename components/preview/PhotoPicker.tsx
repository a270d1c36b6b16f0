// Which reference photo the preview runs on: a reference set, then one of its photos.
import { useEffect } from 'react';
import { Image, Pressable, ScrollView, StyleSheet, View } from 'react-native';
import type { ReferenceImage } from '../../shared/api/references';
import { colors, radius, space } from '../../lib/theme';
import { useDefectKindName, useLabelWords, useReferenceImages, useReferenceSets } from '../../hooks/useReferenceSets';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { ErrorState, LoadingState } from '../StateViews';
import { describeSetCounts } from '../references/setCounts';

export const PICKER_PAGE = 500;

interface PhotoPickerProps {
  partType: string;
  setId: string | null;
  imageId: string | null;
  onSet: (setId: string) => void;
  onPhoto: (image: ReferenceImage) => void;
}

export function PhotoPicker({ partType, setId, imageId, onSet, onPhoto }: PhotoPickerProps) {
  const sets = useReferenceSets();
  const labelText = useLabelWords();
  const kindName = useDefectKindName();
  const images = useReferenceImages(setId, { label: null, defectKind: null, limit: PICKER_PAGE, offset: 0 });
  // The part type's only set is chosen for the engineer, as the trial below chooses it.
  const ofPart = sets.data?.filter((s) => s.partType === partType) ?? [];
  const onlySet = ofPart.length === 1 ? ofPart[0].id : null;
  useEffect(() => {
    if (setId === null && onlySet) onSet(onlySet);
  }, [setId, onlySet, onSet]);
  if (sets.isError) return <ErrorState error={sets.error} onRetry={() => void sets.refetch()} />;
  if (!sets.data) return <LoadingState label="Loading reference sets…" />;
  const offered = ofPart.length > 0 ? ofPart : sets.data;
  if (offered.length === 0) return <AppText tone="muted">No reference sets yet. Create one under Reference sets and upload photos of this part to preview the rule.</AppText>;
  return (
    <View style={styles.group}>
      <ChoiceChips label="Reference set" choices={offered.map((s) => ({ value: s.id, label: `${s.name} (${describeSetCounts(s.counts)})` }))} value={setId ?? ''} onChange={onSet} />
      {setId === null ? null : images.isError ? (
        <ErrorState error={images.error} onRetry={() => void images.refetch()} />
      ) : !images.data ? (
        <LoadingState label="Loading photos…" />
      ) : images.data.items.length === 0 ? (
        <AppText tone="muted">This set has no photos yet. Upload some on the reference set’s page.</AppText>
      ) : (
        <ScrollView horizontal contentContainerStyle={styles.strip} accessibilityLabel="Reference photos">
          {images.data.items.map((image) => {
            const selected = image.id === imageId;
            return (
              <Pressable
                key={image.id}
                accessibilityRole="radio"
                accessibilityState={{ checked: selected }}
                accessibilityLabel={`Photo ${image.fileName}, ${labelText(image)}`}
                onPress={() => onPhoto(image)}
                style={[styles.photo, selected && styles.selected]}
              >
                <Image source={{ uri: image.thumbnailUrl ?? image.imageUrl }} style={styles.thumb} resizeMode="cover" />
                <AppText variant="caption" numberOfLines={1}>{`${selected ? '✓ ' : ''}${image.label}`}</AppText>
                {image.label === 'defective' && image.defectKind ? (
                  <AppText variant="caption" tone="muted" numberOfLines={2}>{kindName(image.defectKind)}</AppText>
                ) : null}
              </Pressable>
            );
          })}
        </ScrollView>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  group: { gap: space.sm },
  strip: { gap: space.sm, paddingBottom: space.xs },
  photo: { width: 96, padding: space.xxs, borderRadius: radius.md, borderWidth: 2, borderColor: 'transparent', gap: space.xxs },
  selected: { borderColor: colors.steel, backgroundColor: colors.steelTint },
  thumb: { width: '100%', aspectRatio: 4 / 3, borderRadius: radius.sm, backgroundColor: colors.surfaceSunken },
});
