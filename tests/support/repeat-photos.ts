// Photos of one demo part taken again and again, for repeatability studies (runs in a plain Node process; see in-node.ts).
import { encodePhoto, planDataset, renderPhoto } from '../../server/demo';
import { planNuisance, planPose } from '../../server/demo/nuisance';
import { createRandom, deriveSeed } from '../../server/demo/random';
import type { FamilyName } from '../../server/demo/types';

/**
 * One defect-free part of the family at 640×480, photographed `count` times: each time placed, lit and
 * exposed a little differently (the generator's own nuisance model). PNG bytes, base64.
 */
export async function photosOfOnePart(family: FamilyName, seed: number, count: number): Promise<string[]> {
  const frame = { width: 640, height: 480 };
  const [plan] = planDataset({ count: 1, seed, families: [family], sizes: [frame], defectShare: 0, retakeShare: 0, colourShare: 0, sixteenBitShare: 0, jpegShare: 0 });
  const photos: string[] = [];
  for (let k = 0; k < count; k++) {
    const random = createRandom(deriveSeed(seed, 1000 + k));
    const spec = { ...plan.spec, pose: planPose(frame.width, frame.height, random), nuisance: planNuisance(frame.width, random) };
    photos.push((await encodePhoto(renderPhoto(spec), 'png', 8)).toString('base64'));
  }
  return photos;
}
