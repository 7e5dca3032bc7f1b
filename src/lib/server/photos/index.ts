/**
 * Photos: the pipeline from upload to stored WebP renditions with the photo rows, adding and removing a
 * build's photos as content changes (./photos), and the S3 object store everything stored goes to
 * (./storage). The request plumbing of the upload routes is ../http/upload.
 */
export * from './photos';
export * from './storage';
