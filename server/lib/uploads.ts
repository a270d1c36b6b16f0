import multer from 'multer';

/** Largest photo file accepted (bytes); a 5 MP 16-bit PNG is about 30 MB. */
export const MAX_PHOTO_BYTES = 40 * 1024 * 1024;
export const MAX_FILES_PER_UPLOAD = 50;

/** Photos are kept in memory for decoding and hashing; their type is checked from the content later. */
export const photoUpload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_PHOTO_BYTES, files: MAX_FILES_PER_UPLOAD, fields: 20 },
});
