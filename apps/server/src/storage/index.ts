export { createObjectStore, contentDisposition, UPLOAD_PART_BYTES, UPLOAD_QUEUE_SIZE } from './object-store';
export type { IncompleteUpload, ObjectInfo, ObjectStore, PutOptions, StoredObject } from './object-store';
export { objectStoreConfigFrom, storageConfigSchema, storageConfigShape } from './storage.config';
export type { ObjectStoreConfig, StorageEnv } from './storage.config';
export {
  asStorageError,
  STORAGE_RETRY_AFTER_SECONDS,
  StorageUnavailable,
  storageUnavailableHandler,
} from './storage-errors';
