/** The demo plant's photo generator: part photos with known defects and their ground truth. */
export { generateDataset, writeDataset, GENERATOR_NAME, type GeneratedImage, type ProgressListener } from './dataset';
export { renderPart, renderPhoto, describeDefects, type Photo, type RenderedPart } from './render';
export { encodePhoto } from './encode';
export {
  planDataset,
  resolveOptions,
  parseFrameSize,
  STANDARD_SIZES,
  RETAKE_REASONS,
  type DatasetOptions,
  type FrameSize,
  type ImagePlan,
} from './plan';
export { PART_FAMILIES, FAMILY_NAMES, isFamilyName, type PartFamily } from './families';
export type * from './types';
