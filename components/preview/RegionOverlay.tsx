// Gauge regions drawn over the preview; while a region is being drawn, a drag (wide screen) or two
// taps on opposite corners (phone) set it. Coordinates are fractions of the photo, as in the rule.
import { useRef, useState } from 'react';
import { StyleSheet, View, type GestureResponderEvent, type LayoutChangeEvent } from 'react-native';
import type { Region } from '../../shared/rules/schema';
import { colors } from '../../lib/theme';
import { AppText } from '../AppText';

export interface OverlayRegion {
  key: string;
  name: string;
  region: Region;
}

interface RegionOverlayProps {
  regions: OverlayRegion[];
  /** The region being drawn, and its shape. */
  drawing: { key: string; shape: Region['shape'] } | null;
  /** Photo width / height, so a circle's radius follows min(width, height) as the engine does. */
  aspect: number;
  onDrawn: (key: string, region: Region) => void;
  /** The region under the finger while it drags (null when the drag ends), for a live measurement. */
  onDrawing?: (region: Region | null) => void;
}

const TAP_SLOP_PX = 8;

function clamp01(v: number): number {
  return Math.min(1, Math.max(0, v));
}

function round3(v: number): number {
  return Math.round(v * 1000) / 1000;
}

/** The region spanned by two corners (fractions), as a rectangle or the circle inside it. */
export function regionFromCorners(a: { x: number; y: number }, b: { x: number; y: number }, shape: Region['shape'], aspect: number): Region | null {
  const x = Math.min(a.x, b.x);
  const y = Math.min(a.y, b.y);
  const w = Math.abs(a.x - b.x);
  const h = Math.abs(a.y - b.y);
  if (w <= 0 || h <= 0) return null;
  if (shape === 'rect') return { shape, x: round3(x), y: round3(y), w: round3(Math.min(w, 1 - x)), h: round3(Math.min(h, 1 - y)) };
  // r is a fraction of min(width, height): convert the box's half sides to that measure.
  const minSideOverWidth = Math.min(1, 1 / aspect);
  const minSideOverHeight = Math.min(1, aspect);
  const r = Math.min(w / 2 / minSideOverWidth, h / 2 / minSideOverHeight);
  return { shape, cx: round3(x + w / 2), cy: round3(y + h / 2), r: round3(Math.max(0.001, Math.min(1, r))) };
}

type Box = { left: number; top: number; width: number; height: number; round: boolean };

/** Room a region's name needs beside the region, in screen pixels (one caption line). */
const NAME_ROOM_PX = 20;

/**
 * Where a region's name goes: just outside the region (above, else below), so that it never hides
 * the pixels being measured; inside only when the region leaves no room on the photo.
 */
function namePlacement(box: Box, frameHeight: number) {
  const side = box.left + box.width / 2 > 0.5 ? styles.nameRight : styles.nameLeft;
  if (box.top * frameHeight >= NAME_ROOM_PX) return [styles.nameOutside, styles.nameAbove, side];
  if ((1 - box.top - box.height) * frameHeight >= NAME_ROOM_PX) return [styles.nameOutside, styles.nameBelow, side];
  return [];
}

function boxOf(region: Region, aspect: number): Box {
  if (region.shape === 'rect') return { left: region.x, top: region.y, width: region.w, height: region.h, round: false };
  const rx = region.r * Math.min(1, 1 / aspect);
  const ry = region.r * Math.min(1, aspect);
  return { left: region.cx - rx, top: region.cy - ry, width: 2 * rx, height: 2 * ry, round: true };
}

export function RegionOverlay({ regions, drawing, aspect, onDrawn, onDrawing }: RegionOverlayProps) {
  const [size, setSize] = useState({ width: 1, height: 1 });
  const start = useRef<{ x: number; y: number; px: number; py: number } | null>(null);
  const [firstCorner, setFirstCorner] = useState<{ x: number; y: number } | null>(null);
  const [rubber, setRubber] = useState<Region | null>(null);

  const point = (event: GestureResponderEvent) => ({
    x: clamp01(event.nativeEvent.locationX / size.width),
    y: clamp01(event.nativeEvent.locationY / size.height),
    px: event.nativeEvent.locationX,
    py: event.nativeEvent.locationY,
  });

  const handlers = drawing
    ? {
        onStartShouldSetResponder: () => true,
        onMoveShouldSetResponder: () => true,
        // A drag over the photo is the drawing: the page's scroll view must not take it over.
        onResponderTerminationRequest: () => false,
        onResponderTerminate: () => {
          start.current = null;
          setRubber(null);
          onDrawing?.(null);
        },
        onResponderGrant: (e: GestureResponderEvent) => {
          start.current = point(e);
        },
        onResponderMove: (e: GestureResponderEvent) => {
          if (!start.current) return;
          const region = regionFromCorners(start.current, point(e), drawing.shape, aspect);
          setRubber(region);
          onDrawing?.(region);
        },
        onResponderRelease: (e: GestureResponderEvent) => {
          const end = point(e);
          const begin = start.current;
          start.current = null;
          setRubber(null);
          onDrawing?.(null);
          if (!begin) return;
          const dragged = Math.hypot(end.px - begin.px, end.py - begin.py) > TAP_SLOP_PX;
          const from = dragged ? begin : firstCorner;
          if (!from) {
            setFirstCorner(end);
            return;
          }
          setFirstCorner(null);
          const region = regionFromCorners(from, end, drawing.shape, aspect);
          if (region) onDrawn(drawing.key, region);
        },
      }
    : {};

  return (
    <View
      style={[StyleSheet.absoluteFill, drawing && styles.drawing]}
      onLayout={(e: LayoutChangeEvent) => {
        setSize({ width: e.nativeEvent.layout.width || 1, height: e.nativeEvent.layout.height || 1 });
      }}
      accessibilityLabel={drawing ? 'Drawing area: drag across the photo, or tap two opposite corners' : undefined}
      {...handlers}
    >
      {regions.map(({ key, name, region }) => {
        const box = boxOf(region, aspect);
        const active = drawing?.key === key;
        return (
          <View
            key={key}
            pointerEvents="none"
            style={[
              styles.region,
              active && styles.regionActive,
              { left: `${box.left * 100}%`, top: `${box.top * 100}%`, width: `${box.width * 100}%`, height: `${box.height * 100}%`, borderRadius: box.round ? 9999 : 0 },
            ]}
          >
            <AppText variant="caption" style={[styles.regionName, ...namePlacement(box, size.height)]} numberOfLines={1}>
              {name}
            </AppText>
          </View>
        );
      })}
      {rubber ? (
        <View
          pointerEvents="none"
          style={[styles.region, styles.rubber, (() => { const b = boxOf(rubber, aspect); return { left: `${b.left * 100}%`, top: `${b.top * 100}%`, width: `${b.width * 100}%`, height: `${b.height * 100}%`, borderRadius: b.round ? 9999 : 0 } as const; })()]}
        />
      ) : null}
      {firstCorner ? <View pointerEvents="none" style={[styles.corner, { left: `${firstCorner.x * 100}%`, top: `${firstCorner.y * 100}%` }]} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  // A mouse drag would otherwise select the region names' text as it crosses them.
  drawing: { cursor: 'crosshair', userSelect: 'none' } as object,
  region: { position: 'absolute', borderWidth: 2, borderColor: colors.focus, borderStyle: 'dashed' },
  regionActive: { borderStyle: 'solid', borderWidth: 3 },
  regionName: { backgroundColor: colors.surface, color: colors.ink, paddingHorizontal: 2, alignSelf: 'flex-start' },
  nameOutside: { position: 'absolute', maxWidth: 220 },
  nameAbove: { bottom: '100%', marginBottom: 2 },
  nameBelow: { top: '100%', marginTop: 2 },
  nameLeft: { left: -2 },
  nameRight: { right: -2 },
  rubber: { borderStyle: 'solid', borderColor: colors.caution },
  corner: { position: 'absolute', width: 12, height: 12, marginLeft: -6, marginTop: -6, borderRadius: 6, borderWidth: 2, borderColor: colors.caution, backgroundColor: colors.surface },
});
