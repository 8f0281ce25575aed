import type { StorageDriver } from './types';

/**
 * Placeholder for the object-store driver (PRODUCT.md §9). The interface already fits an S3 API
 * (whole-object put/get/head/delete by key); until the AWS SDK is added, choosing it stops the
 * process at start rather than failing on the first upload.
 */
export function createS3Storage(): StorageDriver {
  throw new Error('STORAGE_DRIVER=s3 is not available in this build yet: use STORAGE_DRIVER=local');
}
