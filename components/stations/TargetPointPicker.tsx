import { useRef, useState } from 'react';
import { Image, Pressable, StyleSheet, View, type GestureResponderEvent, type LayoutChangeEvent } from 'react-native';
import type { PickedPhoto } from '../../lib/pickPhoto';
import { colors, radius } from '../../lib/theme';
import { AppText } from '../AppText';

export interface ImagePoint {
  x: number;
  y: number;
}

/** Distance between two points in the photo's own pixels. */
export function pixelDistance(a: ImagePoint, b: ImagePoint): number {
  return Math.hypot(b.x - a.x, b.y - a.y);
}

interface TargetPointPickerProps {
  photo: PickedPhoto;
  points: ImagePoint[];
  onChange: (points: ImagePoint[]) => void;
}

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

/** The target's photo; a tap or click marks an edge (two marks measure a distance, a third starts over). */
export function TargetPointPicker({ photo, points, onChange }: TargetPointPickerProps) {
  const [displayWidth, setDisplayWidth] = useState(0);
  const surface = useRef<View>(null);
  const scale = displayWidth > 0 ? photo.width / displayWidth : 1;
  const mark = (event: GestureResponderEvent) => {
    if (displayWidth === 0) return;
    const offset = offsetInSurface(event, surface.current);
    if (!offset) return;
    const point = { x: Math.round(offset.x * scale * 10) / 10, y: Math.round(offset.y * scale * 10) / 10 };
    onChange(points.length >= 2 ? [point] : [...points, point]);
  };
  return (
    <View onLayout={(e: LayoutChangeEvent) => setDisplayWidth(e.nativeEvent.layout.width)} style={styles.frame}>
      <Pressable
        ref={surface}
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
