// One photo from the camera or the photo library, as a Blob ready to upload, with its pixel size.
import { Platform } from 'react-native';
import * as ImagePicker from 'expo-image-picker';

export interface PickedPhoto {
  blob: Blob;
  fileName: string;
  /** Address for <Image> on this device. */
  uri: string;
  width: number;
  height: number;
}

export type PhotoSource = 'camera' | 'library';

/** Undefined when the person cancelled. The camera falls back to the library where there is none. */
export async function pickPhoto(source: PhotoSource): Promise<PickedPhoto | undefined> {
  const options: ImagePicker.ImagePickerOptions = { mediaTypes: ['images'], quality: 1, allowsEditing: false };
  let result: ImagePicker.ImagePickerResult;
  if (source === 'camera') {
    // A browser's file input with capture needs no permission; asking would open the camera stream for nothing.
    const permission = Platform.OS === 'web' ? null : await ImagePicker.requestCameraPermissionsAsync().catch(() => null);
    result = permission?.granted === false ? await ImagePicker.launchImageLibraryAsync(options) : await ImagePicker.launchCameraAsync(options);
  } else {
    result = await ImagePicker.launchImageLibraryAsync(options);
  }
  if (result.canceled || !result.assets?.[0]) return undefined;
  const asset = result.assets[0];
  const blob = asset.file ?? (await (await fetch(asset.uri)).blob());
  return { blob, fileName: asset.fileName ?? asset.file?.name ?? 'part-photo.jpg', uri: asset.uri, width: asset.width, height: asset.height };
}

/** A dropped file (web drag-and-drop) as a picked photo; its pixel size comes from decoding it once. */
export function photoFromFile(file: File): Promise<PickedPhoto> {
  const uri = URL.createObjectURL(file);
  return new Promise((resolve, reject) => {
    const image = new window.Image();
    image.onload = () => resolve({ blob: file, fileName: file.name, uri, width: image.naturalWidth, height: image.naturalHeight });
    image.onerror = () => reject(new Error(`${file.name} is not a photo this browser can read`));
    image.src = uri;
  });
}
