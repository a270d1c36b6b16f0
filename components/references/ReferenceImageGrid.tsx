// Thumbnails of a reference set's photos with their labels; in select mode a press selects instead of labelling.
import { useState } from 'react';
import { Image, Pressable, StyleSheet, View } from 'react-native';
import type { ReferenceImage } from '../../shared/api/references';
import { colors, radius, space } from '../../lib/theme';
import { useDefectKindName } from '../../hooks/useReferenceSets';
import { AppText } from '../AppText';
import { TILE_MIN_WIDTH, tileWidth } from './gridColumns';

const LABEL_MARKS: Record<ReferenceImage['label'], string> = { good: '✓ good', defective: '✕ defective', retake: '↻ retake', unlabelled: '? unlabelled' };

interface ReferenceImageGridProps {
  images: ReferenceImage[];
  selecting: boolean;
  selected: ReadonlySet<string>;
  onPress: (image: ReferenceImage) => void;
}

export function ReferenceImageGrid({ images, selecting, selected, onPress }: ReferenceImageGridProps) {
  const kindName = useDefectKindName();
  const [width, setWidth] = useState<number | null>(null);
  const tile = width === null ? TILE_MIN_WIDTH : tileWidth(width, space.sm);
  return (
    <View style={styles.grid} onLayout={(e) => setWidth(e.nativeEvent.layout.width)}>
      {images.map((image) => {
        const isSelected = selected.has(image.id);
        const labelText = `${LABEL_MARKS[image.label]}${image.defectKind ? ` (${kindName(image.defectKind)})` : ''}`;
        return (
          <Pressable
            key={image.id}
            role={selecting ? 'checkbox' : 'button'}
            aria-checked={selecting ? isSelected : undefined}
            aria-label={`${selecting ? 'Select' : 'Label'} ${image.fileName}, ${labelText}`}
            onPress={() => onPress(image)}
            style={[styles.tile, { width: tile }, isSelected && styles.selected]}
          >
            <View>
              <Image source={{ uri: image.thumbnailUrl ?? image.imageUrl }} style={styles.thumb} resizeMode="cover" />
              {selecting ? (
                <View style={[styles.check, isSelected && styles.checkOn]}>
                  <AppText variant="label" tone={isSelected ? 'onSteel' : 'default'}>{isSelected ? '✓' : ''}</AppText>
                </View>
              ) : null}
            </View>
            <AppText variant="caption" numberOfLines={1}>{image.fileName}</AppText>
            <AppText variant="label" numberOfLines={1} tone={image.label === 'defective' ? 'danger' : image.label === 'good' ? 'notice' : image.label === 'retake' ? 'caution' : 'muted'}>
              {LABEL_MARKS[image.label]}
            </AppText>
            {/* The defect kind on a line of its own: after the label it was cut short in a tile's width. */}
            {image.defectKind ? (
              <AppText variant="caption" tone="danger" numberOfLines={2}>
                {kindName(image.defectKind)}
              </AppText>
            ) : null}
          </Pressable>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  tile: { padding: space.xs, gap: space.xxs, borderRadius: radius.md, borderWidth: 2, borderColor: colors.line, backgroundColor: colors.surface },
  selected: { borderColor: colors.steel, backgroundColor: colors.steelTint },
  thumb: { width: '100%', aspectRatio: 4 / 3, borderRadius: radius.sm, backgroundColor: colors.surfaceSunken },
  check: { position: 'absolute', top: space.xs, left: space.xs, width: 28, height: 28, borderRadius: radius.sm, borderWidth: 2, borderColor: colors.steel, backgroundColor: colors.surface, alignItems: 'center', justifyContent: 'center' },
  checkOn: { backgroundColor: colors.steel },
});
