import { useEffect, useRef, useState } from 'react';
import { Image, Pressable, StyleSheet, View, type GestureResponderEvent, type LayoutChangeEvent } from 'react-native';
import type { PickedPhoto } from '../../lib/pickPhoto';
import { colors, radius } from '../../lib/theme';
import { AppText } from '../AppText';
import { pixelDistance, snapToEdge, type GreyImage, type ImagePoint } from './edgeSnap';
import { readPhotoGrey } from './photoGrey';

export { pixelDistance, type ImagePoint };

/** What happened to the two marks: moved onto the edges, or left where they were tapped. */
export type MarkPlacement = 'tapped' | 'on-edges' | 'no-edge-found';

interface TargetPointPickerProps {
  photo: PickedPhoto;
  points: ImagePoint[];
  onChange: (points: ImagePoint[], placement: MarkPlacement) => void;
}

/** How far (photo pixels) a mark may move to reach an edge: a few screen pixels' worth, at least 6. */
function snapReach(photoPxPerScreenPx: number, a: ImagePoint, b: ImagePoint): number {
  return Math.min(Math.max(6, 6 * photoPxPerScreenPx), pixelDistance(a, b) / 2 - 1);
}

const roundTenth = (p: ImagePoint) => ({ x: Math.round(p.x * 10) / 10, y: Math.round(p.y * 10) / 10 });

const MARK = 22;

/** Where the press landed inside the photo; on the web the DOM's client position against the element's box. */
function offsetInSurface(event: GestureResponderEvent, surface: View | null): ImagePoint | null {
  const native = event.nativeEvent as unknown as { locationX?: number; locationY?: number; clientX?: number; clientY?: number };
  const element = surface as unknown as { getBoundingClientRect?: () => { left: number; top: number } } | null;
  if (element?.getBoundingClientRect && Number.isFinite(native.clientX) && Number.isFinite(native.clientY)) {
    const box = element.getBoundingClientRect();
    return { x: native.clientX! - box.left, y: native.clientY! - box.top };
  }
  if (Number.isFinite(native.locationX) && Number.isFinite(native.locationY)) return { x: native.locationX!, y: native.locationY! };
  return null;
}

/**
 * The target's photo; a tap or click marks an edge (two marks measure a distance, a third starts
 * over). Once both are set, each moves along the line between them onto the nearest clear edge.
 */
export function TargetPointPicker({ photo, points, onChange }: TargetPointPickerProps) {
  const [displayWidth, setDisplayWidth] = useState(0);
  const surface = useRef<View>(null);
  const grey = useRef<Promise<GreyImage | null>>(Promise.resolve(null));
  const taps = useRef(0);
  const scale = displayWidth > 0 ? photo.width / displayWidth : 1;

  useEffect(() => {
    grey.current = readPhotoGrey(photo.uri).catch(() => null);
  }, [photo.uri]);

  const mark = (event: GestureResponderEvent) => {
    if (displayWidth === 0) return;
    const offset = offsetInSurface(event, surface.current);
    if (!offset) return;
    const tap = ++taps.current;
    const point = roundTenth({ x: offset.x * scale, y: offset.y * scale });
    if (points.length !== 1) return onChange([point], 'tapped');
    const [a, b] = [points[0], point];
    onChange([a, b], 'tapped');
    if (pixelDistance(a, b) < 4) return;
    const reach = snapReach(scale, a, b);
    void grey.current.then((image) => {
      // A later tap has started over: this pair is no longer shown.
      if (!image || tap !== taps.current) return;
      const snappedA = snapToEdge(image, a, b, reach);
      const snappedB = snapToEdge(image, b, a, reach);
      if (snappedA && snappedB) onChange([roundTenth(snappedA), roundTenth(snappedB)], 'on-edges');
      else onChange([a, b], 'no-edge-found');
    });
  };
  return (
    <View style={styles.frame}>
      <Pressable
        ref={surface}
        // The photo's own width on screen (inside the frame's border) maps taps to photo pixels.
        onLayout={(e: LayoutChangeEvent) => setDisplayWidth(e.nativeEvent.layout.width)}
        onPress={mark}
        accessibilityRole="button"
        accessibilityLabel="Photo of the calibration target: tap the first edge, then the second"
        style={{ width: '100%', aspectRatio: photo.width / photo.height }}
      >
        <Image source={{ uri: photo.uri }} style={StyleSheet.absoluteFill} resizeMode="stretch" />
        {points.length === 2 && displayWidth > 0 ? (
          <View
            pointerEvents="none"
            style={[
              styles.line,
              {
                left: ((points[0].x + points[1].x) / 2) / scale - pixelDistance(points[0], points[1]) / scale / 2,
                top: ((points[0].y + points[1].y) / 2) / scale - 1,
                width: pixelDistance(points[0], points[1]) / scale,
                transform: [{ rotate: `${Math.atan2(points[1].y - points[0].y, points[1].x - points[0].x)}rad` }],
              },
            ]}
          />
        ) : null}
        {points.map((p, i) => (
          <View key={i} pointerEvents="none" style={[styles.mark, { left: p.x / scale - MARK / 2, top: p.y / scale - MARK / 2 }]}>
            <AppText variant="caption" tone="onSteel">{i === 0 ? 'A' : 'B'}</AppText>
          </View>
        ))}
      </Pressable>
    </View>
  );
}

const styles = StyleSheet.create({
  frame: { width: '100%', borderRadius: radius.md, overflow: 'hidden', borderWidth: 1, borderColor: colors.control },
  mark: {
    position: 'absolute',
    width: MARK,
    height: MARK,
    borderRadius: MARK / 2,
    borderWidth: 2,
    borderColor: colors.onSteel,
    backgroundColor: colors.focus,
    alignItems: 'center',
    justifyContent: 'center',
  },
  line: { position: 'absolute', height: 2, backgroundColor: colors.focus },
});
