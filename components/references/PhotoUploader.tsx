// Adding photos to a reference set: choose many at once (the photo library on a phone, a file
// picker or drag-and-drop on a wide screen), optionally with one label for the whole batch; each
// photo shows its progress and outcome, and the batch its overall progress.
import { useCallback, useRef, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import * as ImagePicker from 'expo-image-picker';
import type { ImageLabel } from '../../shared/api/references';
import type { UploadablePhoto } from '../../lib/api';
import { colors, radius, space } from '../../lib/theme';
import { useLayout } from '../../hooks/useLayout';
import { usePhotoUploads, type UploadItem } from '../../hooks/usePhotoUploads';
import { useDefectKinds, useRefreshReferenceSet } from '../../hooks/useReferenceSets';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ChoiceChips } from '../ChoiceChips';

const STATUS_WORDS: Record<UploadItem['status'], string> = {
  waiting: '… waiting',
  sending: '↑ sending',
  stored: '✓ stored',
  duplicate: '= already in the set',
  refused: '✕ refused',
  failed: '✕ not sent',
};

function Bar({ fraction, label }: { fraction: number; label: string }) {
  return (
    <View role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(fraction * 100)} style={styles.track}>
      <View style={[styles.fill, { width: `${Math.round(fraction * 100)}%` }]} />
    </View>
  );
}

type BatchLabel = ImageLabel;

/** What the server accepts (server/vision/decode.ts and server/lib/uploads.ts), in the engineer's words. */
const ACCEPTED = 'PNG, JPEG, TIFF or WebP photos, 8 or 16 bit, up to 40 MB and 50 megapixels each.';

export function PhotoUploader({ setId }: { setId: string }) {
  const layout = useLayout();
  const refresh = useRefreshReferenceSet(setId);
  const onBatchDone = useCallback(() => void refresh(), [refresh]);
  const uploads = usePhotoUploads(setId, onBatchDone);
  const defectKinds = useDefectKinds();
  const [label, setLabel] = useState<BatchLabel>('unlabelled');
  const [defectKind, setDefectKind] = useState<string | null>(null);
  const [dragging, setDragging] = useState(false);
  const [pickerProblem, setPickerProblem] = useState<string | null>(null);
  const fileInput = useRef<HTMLInputElement | null>(null);

  const defaults = { label: label === 'unlabelled' ? undefined : label, defectKind: label === 'defective' ? defectKind ?? undefined : undefined };
  const addFiles = (files: FileList | File[] | null) => {
    const photos: (UploadablePhoto & { size: number })[] = Array.from(files ?? []).map((file) => ({ name: file.name, blob: file, size: file.size }));
    if (photos.length > 0) uploads.add(photos, defaults);
  };
  // On the web the picker throws for a chosen file that is not an image (its message also offers
  // videos, which a reference set does not take); say so in our words rather than lose the choice.
  const pickWith = async (launch: () => Promise<ImagePicker.ImagePickerResult>): Promise<ImagePicker.ImagePickerAsset[]> => {
    setPickerProblem(null);
    try {
      const result = await launch();
      return result.canceled ? [] : result.assets;
    } catch {
      setPickerProblem(`The chosen file could not be read as a photo. Choose ${ACCEPTED}`);
      return [];
    }
  };
  const pickFromLibrary = async () => {
    const assets = await pickWith(() => ImagePicker.launchImageLibraryAsync({ mediaTypes: ['images'], allowsMultipleSelection: true, quality: 1 }));
    if (assets.length === 0) return;
    const photos = await Promise.all(
      assets.map(async (asset, i) => {
        const name = asset.fileName ?? `photo-${Date.now()}-${i + 1}.jpg`;
        if (asset.file) return { name, blob: asset.file as Blob, size: asset.file.size };
        return { name, uri: asset.uri, type: asset.mimeType ?? 'image/jpeg', size: asset.fileSize ?? undefined };
      }),
    );
    uploads.add(photos, defaults);
  };
  const takePhoto = async () => {
    const permission = await ImagePicker.requestCameraPermissionsAsync();
    if (!permission.granted) return;
    const [asset] = await pickWith(() => ImagePicker.launchCameraAsync({ mediaTypes: ['images'], quality: 1 }));
    if (!asset) return;
    const name = asset.fileName ?? `photo-${Date.now()}.jpg`;
    uploads.add([asset.file ? { name, blob: asset.file as Blob, size: asset.file.size } : { name, uri: asset.uri, type: asset.mimeType ?? 'image/jpeg' }], defaults);
  };

  const done = uploads.items.filter((i) => i.status !== 'waiting' && i.status !== 'sending');
  const counts = (['stored', 'duplicate', 'refused', 'failed'] as const).map((s) => [s, done.filter((i) => i.status === s).length] as const).filter(([, n]) => n > 0);

  return (
    <View style={styles.uploader}>
      <ChoiceChips
        label="Label for the photos you add"
        choices={[
          { value: 'unlabelled', label: 'Label later' },
          { value: 'good', label: 'Good' },
          { value: 'defective', label: 'Defective' },
          { value: 'retake', label: 'Retake' },
        ]}
        value={label}
        onChange={setLabel}
      />
      {label === 'defective' && defectKinds.data ? (
        <ChoiceChips label="Defect kind" choices={[{ value: null, label: 'Not stated' }, ...defectKinds.data.map((k) => ({ value: k.code, label: k.name }))]} value={defectKind} onChange={setDefectKind} />
      ) : null}
      {layout === 'wide' ? (
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={(e) => {
            e.preventDefault();
            setDragging(false);
            // Every dropped file is sent: the server checks the type from the content and names why it refuses one.
            addFiles(e.dataTransfer.files);
          }}
        >
          <View style={[styles.drop, dragging && styles.dropActive]}>
            <AppText variant="bodyStrong">{dragging ? 'Drop the photos to add them' : 'Drag photos here, or choose them'}</AppText>
            <AppText variant="caption" tone="muted">{`${ACCEPTED} Photos already in the set are recognised by their content and not stored twice.`}</AppText>
            <Button label="Choose photos" variant="secondary" onPress={() => fileInput.current?.click()} accessibilityHint="Opens a file picker; you can choose many photos at once" />
          </View>
          <input
            ref={fileInput}
            type="file"
            multiple
            accept="image/png,image/jpeg,image/tiff,image/webp"
            aria-label="Photos to add"
            style={{ display: 'none' }}
            onChange={(e) => {
              addFiles(e.currentTarget.files);
              e.currentTarget.value = '';
            }}
          />
        </div>
      ) : (
        <View style={styles.phoneButtons}>
          <Button label="Choose from library" onPress={() => void pickFromLibrary()} accessibilityHint="You can choose many photos at once" />
          <Button label="Take a photo" variant="secondary" onPress={() => void takePhoto()} />
          <AppText variant="caption" tone="muted" style={styles.full}>{ACCEPTED}</AppText>
        </View>
      )}
      {pickerProblem ? <AppText tone="danger" role="alert">{`✕ ${pickerProblem}`}</AppText> : null}

      {uploads.items.length > 0 ? (
        <View style={styles.progress}>
          <AppText variant="label" role="status" aria-live="polite">
            {uploads.busy
              ? `Adding ${uploads.items.length} photos: ${Math.round(uploads.batchProgress * 100)} %`
              : `Done: ${counts.map(([s, n]) => `${n} ${STATUS_WORDS[s].replace(/^\S+ /, '')}`).join(', ')}`}
          </AppText>
          <Bar fraction={uploads.batchProgress} label="All photos" />
          {uploads.items.map((item) => (
            <View key={item.id} style={styles.item}>
              <View style={styles.itemHead}>
                <AppText variant="caption" numberOfLines={1} style={styles.grow}>{item.name}</AppText>
                <AppText variant="caption" tone={item.status === 'refused' || item.status === 'failed' ? 'danger' : item.status === 'stored' ? 'notice' : 'default'}>
                  {STATUS_WORDS[item.status]}
                </AppText>
              </View>
              {item.status === 'sending' || item.status === 'waiting' ? <Bar fraction={item.progress} label={`Upload of ${item.name}`} /> : null}
              {item.message ? <AppText variant="caption" tone={item.status === 'refused' || item.status === 'failed' ? 'danger' : 'muted'}>{item.message}</AppText> : null}
            </View>
          ))}
          {!uploads.busy ? <Button label="Clear the list" variant="quiet" compact onPress={uploads.clearFinished} style={styles.start} /> : null}
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  uploader: { gap: space.md },
  drop: { alignItems: 'center', gap: space.sm, padding: space.xl, borderWidth: 2, borderStyle: 'dashed', borderColor: colors.control, borderRadius: radius.lg, backgroundColor: colors.surfaceMuted },
  dropActive: { borderColor: colors.focus, backgroundColor: colors.steelTint },
  phoneButtons: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  progress: { gap: space.sm },
  track: { height: 8, borderRadius: radius.pill, backgroundColor: colors.surfaceSunken, borderWidth: 1, borderColor: colors.control, overflow: 'hidden' },
  fill: { height: '100%', backgroundColor: colors.steel },
  item: { gap: space.xxs },
  itemHead: { flexDirection: 'row', gap: space.sm },
  grow: { flex: 1 },
  start: { alignSelf: 'flex-start' },
  full: { flexBasis: '100%' },
});
