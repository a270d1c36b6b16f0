// The vision engine's public surface, for the server adapter and the app's previews.
export * from './image';
export * from './border';
export * from './kernels';
export * from './convolve';
export * from './smoothing';
export * from './median';
export * from './gradient';
export * from './laplacian';
export * from './threshold';
export * from './morphology';
export * from './blobs';
export * from './gauges';
export * from './quality';
export * from './pipeline';
export * from './workspace';
export * from './engine';
export * from './photo-channel';
