import fsDriver from 'unstorage/drivers/fs'
import s3Driver from 'unstorage/drivers/s3'

/**
 * Attachments live outside public/, reached only through the API: in the folder
 * NUXT_UPLOADS_DIR names (which several servers can share, on a network file system), or in an
 * S3-compatible bucket when NUXT_UPLOADS_S3_BUCKET is set.
 */
export default defineNitroPlugin(() => {
  const config = useRuntimeConfig()
  if (config.uploadsS3Bucket) {
    useStorage().mount('uploads', s3Driver({
      bucket: config.uploadsS3Bucket, endpoint: config.uploadsS3Endpoint, region: config.uploadsS3Region,
      accessKeyId: config.uploadsS3AccessKeyId, secretAccessKey: config.uploadsS3SecretAccessKey,
    }))
    return
  }
  useStorage().mount('uploads', fsDriver({ base: config.uploadsDir }))
})
