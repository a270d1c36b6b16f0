// One step's output drawn on a canvas (the app runs on the web target, where react-native-web renders DOM).
import { useEffect, useRef } from 'react';
import type { Image } from '../../shared/vision/image';
import type { OutputKind } from '../../shared/vision/pipeline';
import { renderForDisplay } from './renderStep';

interface StepCanvasProps {
  image: Image;
  kind: OutputKind;
  /** Longest side drawn, in canvas pixels. */
  maxSide: number;
  /** What the picture shows, for screen readers. */
  label: string;
}

export function StepCanvas({ image, kind, maxSide, label }: StepCanvasProps) {
  const canvas = useRef<HTMLCanvasElement | null>(null);
  useEffect(() => {
    const element = canvas.current;
    if (!element) return;
    const pixels = renderForDisplay(image, kind, maxSide);
    element.width = pixels.width;
    element.height = pixels.height;
    const context = element.getContext('2d');
    if (!context) return;
    const data = context.createImageData(pixels.width, pixels.height);
    data.data.set(pixels.rgba);
    context.putImageData(data, 0, 0);
  }, [image, kind, maxSide]);
  return (
    <canvas
      ref={canvas}
      role="img"
      aria-label={label}
      style={{ width: '100%', height: 'auto', display: 'block', imageRendering: 'pixelated', aspectRatio: `${image.width} / ${image.height}` }}
    />
  );
}
