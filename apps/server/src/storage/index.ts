export { createObjectStore, contentDisposition, UPLOAD_PART_BYTES, UPLOAD_QUEUE_SIZE } from './object-store';
export type { ObjectInfo, ObjectStore, PutOptions, StoredObject } from './object-store';
export { objectStoreConfigFrom, storageConfigSchema, storageConfigShape } from './storage.config';
export type { ObjectStoreConfig, StorageEnv } from './storage.config';
