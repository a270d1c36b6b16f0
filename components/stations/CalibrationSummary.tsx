import { formatDate } from '../../lib/format';
import { calibratedPhotoSize, formatPhotoSize, type PhotoSize } from '../../shared/calibration';
import type { Station } from '../../shared/api/stations';
import { AppText } from '../AppText';

export function formatScale(mmPerPx: number): string {
  return `${Number(mmPerPx.toPrecision(4))} mm/px`;
}

/** "0.0875 mm/px for 2592×1944 photos": a scale holds only for photos of the size it was measured in. */
export function formatCalibration(mmPerPx: number, photo: PhotoSize | null): string {
  return photo ? `${formatScale(mmPerPx)} for ${formatPhotoSize(photo)} photos` : formatScale(mmPerPx);
}

/** The station's scale with the photo size it holds for, its quantisation uncertainty, and who calibrated it when. */
export function CalibrationSummary({ station }: { station: Station }) {
  if (station.mmPerPx === null) return <AppText tone="caution">⚠ Not calibrated: gauges in mm and mm² cannot be measured here yet.</AppText>;
  const photoSize = calibratedPhotoSize(station);
  return (
    <>
      <AppText variant="bodyStrong">
        {`${formatCalibration(station.mmPerPx, photoSize)} · quantisation u = ${Number((station.quantisationUncertaintyMm ?? 0).toPrecision(3))} mm`}
      </AppText>
      {photoSize ? null : (
        <AppText variant="caption" tone="caution">⚠ Photo size not recorded: photos of any size are measured with this scale. Calibrate again to record it.</AppText>
      )}
      <AppText variant="caption" tone="muted">
        {station.calibratedAt ? `Calibrated by ${station.calibratedBy ?? 'unknown'} on ${formatDate(station.calibratedAt)}` : 'Calibration date not recorded'}
      </AppText>
    </>
  );
}
