export { deliverableUpload, uploadedFile } from './deliverable-upload';
export type { DeliverableUploadOptions } from './deliverable-upload';
export { deliverableStorage } from './storage-engine';
export type { DeliverableStorageOptions, StoredUpload } from './storage-engine';
export { ACCEPTED_EXTENSIONS, DELIVERABLE_KINDS, executableSignature, kindForExtension, sniff } from './content-rules';
export type { DeliverableKind } from './content-rules';
export { ARCHIVE_LIMITS, checkStoredContainer } from './archive-check';
export { extensionOf, safeFileName } from './file-name';
export { rejection } from './rejections';
