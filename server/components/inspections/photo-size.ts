// A photo of another size than the station's calibration was made for is a RETAKE before any rule runs.
import { calibratedPhotoSize, photoSizeProblem } from '../../../shared/calibration';
import type { RawPhoto } from '../../../shared/vision/image';
import type { StationEntity } from '../stations/entities';

/**
 * The quality record of a photo the station's scale does not hold for, or null when it does. Stored
 * as the quality gate's own judgements are (pass, problems), with the photo's size beside them; no
 * focus, exposure or brightness figures, since the rule is not run.
 */
export function wrongSizeQuality(photo: Pick<RawPhoto, 'width' | 'height'>, station: Pick<StationEntity, 'photoWidthPx' | 'photoHeightPx'>): { pass: false; problems: string[]; widthPx: number; heightPx: number } | null {
  const size = { widthPx: photo.width, heightPx: photo.height };
  const problem = photoSizeProblem(size, calibratedPhotoSize(station));
  return problem ? { pass: false, problems: [problem], ...size } : null;
}
