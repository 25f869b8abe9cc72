import "server-only";

// The app's door to photo storage; scripts and tests may import ./client and ./images directly.
export { deleteObjects, getObject, putObject } from "./client";
export { storageConfig, StorageNotConfigured } from "./config";
export {
  MAX_PHOTO_BYTES,
  MAX_PHOTOS_PER_UPLOAD,
  photoKeys,
  preparePhoto,
  sniffImage,
  type PreparedPhoto,
} from "./images";
