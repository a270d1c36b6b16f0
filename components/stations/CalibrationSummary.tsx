import { formatDate } from '../../lib/format';
import type { Station } from '../../shared/api/stations';
import { AppText } from '../AppText';

export function formatScale(mmPerPx: number): string {
  return `${Number(mmPerPx.toPrecision(4))} mm/px`;
}

/** The station's scale, its quantisation uncertainty, and who calibrated it when. */
export function CalibrationSummary({ station }: { station: Station }) {
  if (station.mmPerPx === null) return <AppText tone="caution">⚠ Not calibrated: gauges in mm and mm² cannot be measured here yet.</AppText>;
  return (
    <>
      <AppText variant="bodyStrong">
        {`${formatScale(station.mmPerPx)} · quantisation u = ${Number((station.quantisationUncertaintyMm ?? 0).toPrecision(3))} mm`}
      </AppText>
      <AppText variant="caption" tone="muted">
        {station.calibratedAt ? `Calibrated by ${station.calibratedBy ?? 'unknown'} on ${formatDate(station.calibratedAt)}` : 'Calibration date not recorded'}
      </AppText>
    </>
  );
}
