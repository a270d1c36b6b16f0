import { useState } from 'react';
import { useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { useCalibrateStation, useLines } from '../../hooks/useStations';
import { validateForm, type FieldErrors } from '../../lib/formErrors';
import { pickPhoto, type PickedPhoto } from '../../lib/pickPhoto';
import { calloutStyle, colors, radius, space } from '../../lib/theme';
import { calibratedPhotoSize, pixelQuantisationUncertaintyMm, scaleFromReference } from '../../shared/calibration';
import { calibrationFormSchema } from '../../shared/api/stations';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ConfirmDialog } from '../ConfirmDialog';
import { ErrorBanner } from '../ErrorBanner';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { TextField } from '../TextField';
import { CalibrationSummary, formatCalibration } from './CalibrationSummary';
import { pixelDistance, TargetPointPicker, type ImagePoint, type MarkPlacement } from './TargetPointPicker';

function parseNumber(text: string): number {
  return text.trim() === '' ? Number.NaN : Number(text.replace(',', '.'));
}

/** A whole number of pixels, one of a pair side by side. */
function PixelField({ label, value, error, onChange }: { label: string; value: string; error?: string; onChange: (text: string) => void }) {
  return (
    <View style={styles.sizeField}>
      <TextField label={label} value={value} onChangeText={onChange} keyboardType="number-pad" inputMode="numeric" error={error} />
    </View>
  );
}

/** Calibrate a station from a target of known length: mm/px and its quantisation uncertainty shown before saving. */
export function CalibrationScreen({ stationId }: { stationId: string }) {
  const router = useRouter();
  const lines = useLines();
  const calibrate = useCalibrateStation();
  const [lengthText, setLengthText] = useState('');
  const [distanceText, setDistanceText] = useState('');
  const [widthText, setWidthText] = useState('');
  const [heightText, setHeightText] = useState('');
  const [photo, setPhoto] = useState<PickedPhoto>();
  const [points, setPoints] = useState<ImagePoint[]>([]);
  const [placement, setPlacement] = useState<MarkPlacement>('tapped');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [confirming, setConfirming] = useState(false);
  const [saved, setSaved] = useState(false);

  const station = lines.data?.flatMap((l) => l.stations).find((s) => s.id === stationId);
  if (lines.isPending) return <Screen title="Calibration" width="reading"><LoadingState label="Loading the station…" /></Screen>;
  if (lines.error) return <Screen title="Calibration" width="reading"><ErrorState error={lines.error} onRetry={() => void lines.refetch()} /></Screen>;
  if (!station)
    return (
      <Screen title="Calibration" width="reading">
        <EmptyState title="No such station" body="It may have been removed. Go back to the stations and choose one." action={<Button label="Back to stations" onPress={() => router.push('/stations')} />} />
      </Screen>
    );

  const referenceLengthMm = parseNumber(lengthText);
  const distancePx = parseNumber(distanceText);
  const ready = referenceLengthMm > 0 && distancePx > 0;
  const mmPerPx = ready ? scaleFromReference(referenceLengthMm, distancePx) : null;
  const photoWidthPx = parseNumber(widthText);
  const photoHeightPx = parseNumber(heightText);
  const photoSize = Number.isInteger(photoWidthPx) && Number.isInteger(photoHeightPx) && photoWidthPx > 0 && photoHeightPx > 0 ? { widthPx: photoWidthPx, heightPx: photoHeightPx } : null;

  const choosePhoto = async () => {
    const picked = await pickPhoto('library').catch(() => undefined);
    if (picked) {
      setPhoto(picked);
      setPoints([]);
      // The target's photo comes from the station's camera: its size is the size the scale holds for.
      setWidthText(String(picked.width));
      setHeightText(String(picked.height));
      setErrors((e) => ({ ...e, photoWidthPx: undefined, photoHeightPx: undefined }));
    }
  };
  const markPoints = (next: ImagePoint[], how: MarkPlacement) => {
    setPoints(next);
    setPlacement(how);
    if (next.length === 2) {
      setDistanceText(pixelDistance(next[0], next[1]).toFixed(1));
      setErrors((e) => ({ ...e, distancePx: undefined }));
    }
  };
  const changeSize = (field: 'photoWidthPx' | 'photoHeightPx', text: string) => {
    (field === 'photoWidthPx' ? setWidthText : setHeightText)(text);
    setErrors((e) => ({ ...e, [field]: undefined }));
  };
  const review = () => {
    const result = validateForm(calibrationFormSchema, { referenceLengthMm, distancePx, photoWidthPx, photoHeightPx });
    if (!result.ok) {
      setErrors({
        ...result.errors,
        referenceLengthMm: Number.isNaN(referenceLengthMm) ? 'Enter the target’s length in mm' : result.errors.referenceLengthMm,
        distancePx: Number.isNaN(distancePx) ? 'Mark two edges on the photo or enter the distance in pixels' : result.errors.distancePx,
      });
      return;
    }
    setConfirming(true);
  };

  return (
    <Screen
      title={`Calibrate ${station.name}`}
      subtitle={station.lineName}
      width="reading"
      actions={<Button label="Back to stations" variant="quiet" compact onPress={() => router.push('/stations')} />}
    >
      <Card>
        <AppText variant="heading">Now</AppText>
        <CalibrationSummary station={station} />
      </Card>
      <Card style={styles.form}>
        <AppText variant="heading">New calibration</AppText>
        <AppText tone="muted">
          Photograph a target of known size (a gauge block, a ruled plate) at the station, exactly where parts sit, with the station’s camera set-up.
        </AppText>
        <TextField
          label="Known length of the target (mm)"
          value={lengthText}
          onChangeText={(text) => {
            setLengthText(text);
            setErrors((e) => ({ ...e, referenceLengthMm: undefined }));
          }}
          keyboardType="decimal-pad"
          inputMode="decimal"
          error={errors.referenceLengthMm}
        />
        <Button label={photo ? 'Choose another photo of the target' : 'Choose a photo of the target'} variant="secondary" onPress={() => void choosePhoto()} />
        {photo ? (
          <>
            <AppText variant="caption" tone="muted">{`${photo.fileName}, ${photo.width}×${photo.height} px. Tap the first edge (A), then the second (B).`}</AppText>
            <TargetPointPicker photo={photo} points={points} onChange={markPoints} />
            {points.length === 2 && placement !== 'tapped' ? (
              <AppText variant="caption" tone={placement === 'on-edges' ? 'notice' : 'caution'} role="status">
                {placement === 'on-edges'
                  ? `✓ A and B moved onto the edges nearest your taps: (${points[0].x}, ${points[0].y}) and (${points[1].x}, ${points[1].y}) px.`
                  : '⚠ No clear edge near one of the marks, so both stay where you tapped. Tap closer to the edges, or type the distance.'}
              </AppText>
            ) : null}
          </>
        ) : null}
        <TextField
          label="Distance between the two edges (px)"
          hint="Measured from the two marks, or typed in from another measurement."
          value={distanceText}
          onChangeText={(text) => {
            setDistanceText(text);
            setErrors((e) => ({ ...e, distancePx: undefined }));
          }}
          keyboardType="decimal-pad"
          inputMode="decimal"
          error={errors.distancePx}
        />
        <AppText tone="muted">The scale holds only for photos of this size from this camera; photos of another size are sent back for a retake.</AppText>
        <View style={styles.sizeRow}>
          <PixelField label="Photo width (px)" value={widthText} error={errors.photoWidthPx} onChange={(text) => changeSize('photoWidthPx', text)} />
          <PixelField label="Photo height (px)" value={heightText} error={errors.photoHeightPx} onChange={(text) => changeSize('photoHeightPx', text)} />
        </View>
        <View style={styles.result} role="status" aria-live="polite">
          {mmPerPx !== null ? (
            <>
              <AppText variant="heading">{formatCalibration(mmPerPx, photoSize)}</AppText>
              <AppText>{`Standard uncertainty from one pixel’s quantisation, u = s/√12 = ${Number(pixelQuantisationUncertaintyMm(mmPerPx).toPrecision(3))} mm`}</AppText>
              <AppText variant="caption" tone="muted">{`${referenceLengthMm} mm over ${distancePx} px. One pixel is ${Number(mmPerPx.toPrecision(4))} mm wide here.`}</AppText>
            </>
          ) : (
            <AppText tone="muted">Enter the length and the distance to see the scale.</AppText>
          )}
        </View>
        {/* Beside the button just pressed: the dialog gives the focus back to it, on a phone far below the top. */}
        {saved ? (
          <View style={styles.notice} role="status">
            <AppText variant="bodyStrong" tone="notice">✓ Calibration saved. Gauges in mm at this station use it from the next inspection.</AppText>
          </View>
        ) : null}
        <View style={styles.actions}>
          <Button label="Save calibration" onPress={review} />
        </View>
      </Card>
      <ConfirmDialog
        visible={confirming}
        title="Save this calibration?"
        message={`${station.name} will measure at ${mmPerPx !== null ? formatCalibration(mmPerPx, photoSize) : '—'}${station.mmPerPx !== null ? ` instead of ${formatCalibration(station.mmPerPx, calibratedPhotoSize(station))}` : ''}. Every gauge in mm or mm² at this station uses it from the next inspection; a photo of another size gets RETAKE. Earlier inspections keep the scale they were measured with.`}
        confirmLabel="Save calibration"
        busy={calibrate.isPending}
        error={calibrate.error}
        onCancel={() => {
          setConfirming(false);
          calibrate.reset();
        }}
        onConfirm={() =>
          calibrate.mutate(
            { id: station.id, referenceLengthMm, distancePx, photoWidthPx, photoHeightPx },
            {
              onSuccess: () => {
                setConfirming(false);
                setSaved(true);
                setLengthText('');
                setDistanceText('');
                setWidthText('');
                setHeightText('');
                setPoints([]);
                // The form closes up, so that the confirmation and the new scale at the top are in view.
                setPhoto(undefined);
              },
            },
          )
        }
      />
      {calibrate.error && !confirming ? <ErrorBanner error={calibrate.error} /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  form: { gap: space.md },
  result: { gap: space.xxs, padding: space.md, borderRadius: radius.md, backgroundColor: colors.surfaceSunken },
  actions: { flexDirection: 'row', justifyContent: 'flex-end' },
  sizeRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  sizeField: { flexGrow: 1, flexBasis: 140 },
  notice: calloutStyle('notice'),
});
