/** The photo conditions a rule has to live with, and the deliberately unusable ones (retakes). */
import type { Random } from './random';
import type { Nuisance, Pose, RetakeReason } from './types';

export const OVER_EXPOSURE_SHARE = 0.12;
const MAX_SHIFT_SHARE = 0.04;
const MAX_ROTATION_DEG = 4;

export function planPose(width: number, height: number, random: Random): Pose {
  return {
    centreX: width / 2 + random.between(-MAX_SHIFT_SHARE, MAX_SHIFT_SHARE) * width,
    centreY: height / 2 + random.between(-MAX_SHIFT_SHARE, MAX_SHIFT_SHARE) * height,
    angleDeg: random.between(-MAX_ROTATION_DEG, MAX_ROTATION_DEG),
  };
}

/**
 * Light falling off towards one side and the corners, a slight defocus, sensor noise and now and then
 * some over-exposure; a retake reason replaces the relevant part with something no rule should judge.
 */
export function planNuisance(width: number, random: Random, retakeReason?: RetakeReason): Nuisance {
  const nuisance: Nuisance = {
    gradientX: random.between(-0.1, 0.1),
    gradientY: random.between(-0.1, 0.1),
    vignette: random.between(0.05, 0.18),
    gain: random.chance(OVER_EXPOSURE_SHARE) ? random.between(1.12, 1.25) : random.between(0.92, 1.05),
    blurSigmaPx: random.between(0.35, 0.8),
    readNoise: random.between(0.002, 0.0035),
    shotNoise: random.between(0.00002, 0.00005),
    noiseSeed: Math.floor(random.next() * 4294967296),
  };
  switch (retakeReason) {
    case 'blur':
      nuisance.blurSigmaPx = Math.max(4, width * random.between(0.006, 0.01));
      break;
    case 'dark':
      nuisance.gain = random.between(0.06, 0.12);
      break;
    case 'clipped':
      nuisance.gain = random.between(2.6, 3.4);
      break;
  }
  return nuisance;
}
