import fsDriver from 'unstorage/drivers/fs'

/** Attachments live outside public/, in the folder NUXT_UPLOADS_DIR names, reached only through the API. */
export default defineNitroPlugin(() => {
  useStorage().mount('uploads', fsDriver({ base: useRuntimeConfig().uploadsDir }))
})
